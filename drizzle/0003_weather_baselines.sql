CREATE TABLE "baselines" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"carrier" "energy_carrier" NOT NULL,
	"period_from" date NOT NULL,
	"period_to" date NOT NULL,
	"granularity" text NOT NULL,
	"model" jsonb NOT NULL,
	"created_by_user_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "baselines_organization_id_id_pk" PRIMARY KEY("organization_id","id"),
	CONSTRAINT "baselines_granularity_check" CHECK ("baselines"."granularity" in ('monthly', 'daily')),
	CONSTRAINT "baselines_period_check" CHECK ("baselines"."period_from" <= "baselines"."period_to")
);
--> statement-breakpoint
CREATE TABLE "daily_weather" (
	"organization_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"day" date NOT NULL,
	"mean_temp_c" numeric(5, 2) NOT NULL,
	"source" text NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "daily_weather_organization_id_site_id_day_pk" PRIMARY KEY("organization_id","site_id","day"),
	CONSTRAINT "daily_weather_source_check" CHECK ("daily_weather"."source" in ('upload', 'seed'))
);
--> statement-breakpoint
ALTER TABLE "baselines" ADD CONSTRAINT "baselines_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "baselines" ADD CONSTRAINT "baselines_organization_id_site_id_sites_organization_id_id_fk" FOREIGN KEY ("organization_id","site_id") REFERENCES "public"."sites"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "daily_weather" ADD CONSTRAINT "daily_weather_organization_id_site_id_sites_organization_id_id_fk" FOREIGN KEY ("organization_id","site_id") REFERENCES "public"."sites"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "baselines_site_idx" ON "baselines" USING btree ("organization_id","site_id","carrier");