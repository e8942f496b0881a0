ALTER TYPE "public"."meter_quantity" ADD VALUE 'solid_fuel';--> statement-breakpoint
CREATE TABLE "tank_deliveries" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"meter_id" uuid NOT NULL,
	"delivered_at" timestamp with time zone NOT NULL,
	"volume_l" numeric(12, 3) NOT NULL,
	"density_kg_l" numeric(6, 4),
	"calorific_value_mj_kg" numeric(6, 3),
	"note" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tank_deliveries_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "tank_dips" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"dipped_at" timestamp with time zone NOT NULL,
	"stock_l" numeric(12, 3) NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tank_dips_organization_id_meter_id_dipped_at_pk" PRIMARY KEY("organization_id","meter_id","dipped_at")
);
--> statement-breakpoint
CREATE TABLE "tanks" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"capacity_l" numeric(12, 3) NOT NULL,
	"density_kg_l" numeric(6, 4) NOT NULL,
	"calorific_value_mj_kg" numeric(6, 3) NOT NULL,
	"cv_basis" text DEFAULT 'gross' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tanks_organization_id_meter_id_pk" PRIMARY KEY("organization_id","meter_id"),
	CONSTRAINT "tanks_cv_basis_check" CHECK ("tanks"."cv_basis" in ('gross', 'net'))
);
--> statement-breakpoint
ALTER TABLE "tank_deliveries" ADD CONSTRAINT "tank_deliveries_organization_id_meter_id_tanks_organization_id_meter_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."tanks"("organization_id","meter_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tank_dips" ADD CONSTRAINT "tank_dips_organization_id_meter_id_tanks_organization_id_meter_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."tanks"("organization_id","meter_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tanks" ADD CONSTRAINT "tanks_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "tank_deliveries_meter_idx" ON "tank_deliveries" USING btree ("organization_id","meter_id","delivered_at");