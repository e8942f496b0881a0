CREATE TABLE "cost_adjustments" (
	"organization_id" uuid NOT NULL,
	"id" bigserial NOT NULL,
	"tariff_id" uuid NOT NULL,
	"month" date NOT NULL,
	"delta_cost" numeric NOT NULL,
	"currency" text NOT NULL,
	"source" text NOT NULL,
	"reason" text NOT NULL,
	"actor_user_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "cost_adjustments_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "monthly_costs" (
	"organization_id" uuid NOT NULL,
	"tariff_id" uuid NOT NULL,
	"month" date NOT NULL,
	"cost" numeric NOT NULL,
	"currency" text NOT NULL,
	"parts" jsonb NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"rollups_updated_at" timestamp with time zone,
	CONSTRAINT "monthly_costs_organization_id_tariff_id_month_pk" PRIMARY KEY("organization_id","tariff_id","month")
);
--> statement-breakpoint
CREATE TABLE "tariff_versions" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"tariff_id" uuid NOT NULL,
	"valid_from" date NOT NULL,
	"valid_to" date,
	"rates" jsonb NOT NULL,
	"created_by_user_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tariff_versions_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "tariffs" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"site_id" uuid NOT NULL,
	"carrier" "energy_carrier" NOT NULL,
	"meter_id" uuid,
	"currency" text NOT NULL,
	"illustrative" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tariffs_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
ALTER TABLE "cost_adjustments" ADD CONSTRAINT "cost_adjustments_organization_id_tariff_id_tariffs_organization_id_id_fk" FOREIGN KEY ("organization_id","tariff_id") REFERENCES "public"."tariffs"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "monthly_costs" ADD CONSTRAINT "monthly_costs_organization_id_tariff_id_tariffs_organization_id_id_fk" FOREIGN KEY ("organization_id","tariff_id") REFERENCES "public"."tariffs"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tariff_versions" ADD CONSTRAINT "tariff_versions_organization_id_tariff_id_tariffs_organization_id_id_fk" FOREIGN KEY ("organization_id","tariff_id") REFERENCES "public"."tariffs"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tariffs" ADD CONSTRAINT "tariffs_organization_id_site_id_sites_organization_id_id_fk" FOREIGN KEY ("organization_id","site_id") REFERENCES "public"."sites"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tariffs" ADD CONSTRAINT "tariffs_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "cost_adjustments_month_idx" ON "cost_adjustments" USING btree ("organization_id","month");--> statement-breakpoint
CREATE INDEX "tariff_versions_tariff_idx" ON "tariff_versions" USING btree ("organization_id","tariff_id","valid_from");--> statement-breakpoint
CREATE UNIQUE INDEX "tariffs_meter_unique" ON "tariffs" USING btree ("organization_id","meter_id") WHERE "tariffs"."meter_id" is not null;--> statement-breakpoint
CREATE UNIQUE INDEX "tariffs_site_carrier_unique" ON "tariffs" USING btree ("organization_id","site_id","carrier") WHERE "tariffs"."meter_id" is null;