CREATE TYPE "public"."plant_kind" AS ENUM('boiler', 'chp', 'heat_pump', 'chiller', 'fuel_cell');--> statement-breakpoint
CREATE TYPE "public"."plant_meter_role" AS ENUM('fuel_in', 'electricity_in', 'heat_out', 'cooling_out', 'electricity_out');--> statement-breakpoint
CREATE TABLE "plant_meters" (
	"organization_id" uuid NOT NULL,
	"plant_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"role" "plant_meter_role" NOT NULL,
	CONSTRAINT "plant_meters_organization_id_plant_id_meter_id_pk" PRIMARY KEY("organization_id","plant_id","meter_id")
);
--> statement-breakpoint
CREATE TABLE "plants" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"kind" "plant_kind" NOT NULL,
	"name" text NOT NULL,
	"fuel_cv_basis" text DEFAULT 'gross' NOT NULL,
	"heat_flow_c" numeric(5, 1),
	"heat_return_c" numeric(5, 1),
	"chilled_flow_c" numeric(5, 1),
	"chilled_return_c" numeric(5, 1),
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"archived_at" timestamp with time zone,
	CONSTRAINT "plants_organization_id_id_pk" PRIMARY KEY("organization_id","id"),
	CONSTRAINT "plants_fuel_cv_basis_check" CHECK ("plants"."fuel_cv_basis" in ('gross', 'net'))
);
--> statement-breakpoint
ALTER TABLE "alert_settings" ADD COLUMN "plant_fault" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "plant_meters" ADD CONSTRAINT "plant_meters_organization_id_plant_id_plants_organization_id_id_fk" FOREIGN KEY ("organization_id","plant_id") REFERENCES "public"."plants"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plant_meters" ADD CONSTRAINT "plant_meters_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plants" ADD CONSTRAINT "plants_organization_id_site_id_sites_organization_id_id_fk" FOREIGN KEY ("organization_id","site_id") REFERENCES "public"."sites"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "plants_name_unique" ON "plants" USING btree ("organization_id","site_id",lower("name"));