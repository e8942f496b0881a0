CREATE TABLE "calorific_values" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"period_kind" text NOT NULL,
	"period_start" date NOT NULL,
	"calorific_value_mj_m3" numeric(7, 4) NOT NULL,
	"basis" text NOT NULL,
	"source" text DEFAULT '' NOT NULL,
	"entered_by_user_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "calorific_values_organization_id_meter_id_period_kind_period_start_pk" PRIMARY KEY("organization_id","meter_id","period_kind","period_start"),
	CONSTRAINT "calorific_values_period_kind_check" CHECK ("calorific_values"."period_kind" in ('month', 'day')),
	CONSTRAINT "calorific_values_month_start_check" CHECK ("calorific_values"."period_kind" = 'day' or extract(day from "calorific_values"."period_start") = 1),
	CONSTRAINT "calorific_values_basis_check" CHECK ("calorific_values"."basis" in ('gross', 'net')),
	CONSTRAINT "calorific_values_range_check" CHECK ("calorific_values"."calorific_value_mj_m3" between 10 and 60)
);
--> statement-breakpoint
CREATE TABLE "gas_interval_volumes" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"interval_start" timestamp with time zone NOT NULL,
	"volume_m3" numeric(24, 9) NOT NULL,
	"calorific_value_mj_m3" numeric(7, 4),
	"energy_kwh" numeric(20, 6) NOT NULL,
	CONSTRAINT "gas_interval_volumes_organization_id_meter_id_interval_start_pk" PRIMARY KEY("organization_id","meter_id","interval_start")
);
--> statement-breakpoint
CREATE TABLE "gas_meter_settings" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"register_unit" text,
	"correction_factor" numeric(8, 6),
	"gas_temp_c" numeric(5, 2),
	"gas_pressure_mbar_g" numeric(7, 2),
	"atmospheric_pressure_mbar" numeric(6, 2),
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "gas_meter_settings_organization_id_meter_id_pk" PRIMARY KEY("organization_id","meter_id"),
	CONSTRAINT "gas_meter_settings_unit_check" CHECK ("gas_meter_settings"."register_unit" is null or "gas_meter_settings"."register_unit" in ('m3', 'hcf'))
);
--> statement-breakpoint
ALTER TABLE "calorific_values" ADD CONSTRAINT "calorific_values_entered_by_user_id_users_id_fk" FOREIGN KEY ("entered_by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calorific_values" ADD CONSTRAINT "calorific_values_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gas_interval_volumes" ADD CONSTRAINT "gas_interval_volumes_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gas_meter_settings" ADD CONSTRAINT "gas_meter_settings_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;