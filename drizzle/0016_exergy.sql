CREATE TABLE "interval_exergy" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"interval_start" timestamp with time zone NOT NULL,
	"heat_kwh" numeric(24, 9) NOT NULL,
	"entropy_kwh_per_k" numeric(24, 12) NOT NULL,
	"flow_limit_c" numeric(7, 3),
	"heating" boolean NOT NULL,
	CONSTRAINT "interval_exergy_organization_id_meter_id_interval_start_pk" PRIMARY KEY("organization_id","meter_id","interval_start")
);
--> statement-breakpoint
CREATE TABLE "monthly_exergy" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"month" date NOT NULL,
	"exergy_kwh" numeric(24, 6) DEFAULT '0' NOT NULL,
	"intervals" integer DEFAULT 0 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "monthly_exergy_organization_id_meter_id_month_pk" PRIMARY KEY("organization_id","meter_id","month")
);
--> statement-breakpoint
ALTER TABLE "interval_exergy" ADD CONSTRAINT "interval_exergy_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "monthly_exergy" ADD CONSTRAINT "monthly_exergy_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;