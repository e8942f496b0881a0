CREATE TABLE "alert_events" (
	"organization_id" uuid NOT NULL,
	"id" bigserial NOT NULL,
	"kind" text NOT NULL,
	"subject" text NOT NULL,
	"title" text NOT NULL,
	"opened_at" timestamp with time zone NOT NULL,
	"cleared_at" timestamp with time zone,
	CONSTRAINT "alert_events_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "alert_settings" (
	"organization_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"silent_meter" boolean NOT NULL,
	"residual" boolean NOT NULL,
	"month_ready" boolean NOT NULL,
	"silent_hours" integer DEFAULT 24 NOT NULL,
	CONSTRAINT "alert_settings_organization_id_user_id_pk" PRIMARY KEY("organization_id","user_id")
);
--> statement-breakpoint
ALTER TABLE "alert_events" ADD CONSTRAINT "alert_events_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alert_settings" ADD CONSTRAINT "alert_settings_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alert_settings" ADD CONSTRAINT "alert_settings_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "alert_events_open_unique" ON "alert_events" USING btree ("organization_id","kind","subject") WHERE "alert_events"."cleared_at" is null;