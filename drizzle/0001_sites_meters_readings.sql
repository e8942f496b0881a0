CREATE TYPE "public"."energy_carrier" AS ENUM('heat', 'cooling', 'steam', 'electricity');--> statement-breakpoint
CREATE TYPE "public"."interval_quality" AS ENUM('measured', 'estimated', 'edited', 'missing');--> statement-breakpoint
CREATE TYPE "public"."boundary_orientation" AS ENUM('import', 'export');--> statement-breakpoint
CREATE TYPE "public"."meter_quantity" AS ENUM('water_heat', 'steam_heat', 'sensible_heat', 'electric_work', 'electric_register', 'heat_register');--> statement-breakpoint
CREATE TYPE "public"."sensor_position" AS ENUM('flow', 'return');--> statement-breakpoint
CREATE TABLE "ingest_batches" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"source" text NOT NULL,
	"gateway_id" uuid,
	"user_id" text,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"accepted" integer NOT NULL,
	"repeats" integer NOT NULL,
	"rejected" integer NOT NULL,
	"conflicts" integer NOT NULL,
	CONSTRAINT "ingest_batches_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "intervals" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"hour_start" timestamp with time zone NOT NULL,
	"energy_kwh" numeric(20, 6) NOT NULL,
	"quality" interval_quality NOT NULL,
	"flags" text[] DEFAULT '{}'::text[] NOT NULL,
	"source_reading_times" timestamp with time zone[] DEFAULT '{}'::timestamptz[] NOT NULL,
	"estimate_method" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "intervals_organization_id_meter_id_hour_start_pk" PRIMARY KEY("organization_id","meter_id","hour_start")
) PARTITION BY RANGE ("hour_start");
--> statement-breakpoint
CREATE TABLE "meters" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"quantity" "meter_quantity" NOT NULL,
	"carrier" "energy_carrier" NOT NULL,
	"orientation" "boundary_orientation" NOT NULL,
	"parent_meter_id" uuid,
	"serial" text DEFAULT '' NOT NULL,
	"multiplier" numeric(12, 4) DEFAULT '1' NOT NULL,
	"rollover_kwh" numeric(16, 3),
	"sensor_at" "sensor_position",
	"default_pressure_bar_abs" numeric(6, 3),
	"spike_factor" numeric(6, 2) DEFAULT '10' NOT NULL,
	"installed_at" timestamp with time zone NOT NULL,
	"removed_at" timestamp with time zone,
	"replaced_by_meter_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "meters_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "raw_readings" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"reading_time" timestamp with time zone NOT NULL,
	"end_time" timestamp with time zone,
	"payload" jsonb NOT NULL,
	"payload_hash" text NOT NULL,
	"energy_kwh" numeric(20, 6),
	"register_kwh" numeric(20, 4),
	"batch_id" uuid NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "raw_readings_organization_id_meter_id_reading_time_pk" PRIMARY KEY("organization_id","meter_id","reading_time")
) PARTITION BY RANGE ("reading_time");
--> statement-breakpoint
CREATE TABLE "reading_conflicts" (
	"organization_id" uuid NOT NULL,
	"id" bigserial NOT NULL,
	"meter_id" uuid NOT NULL,
	"reading_time" timestamp with time zone NOT NULL,
	"payload" jsonb NOT NULL,
	"batch_id" uuid NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"resolved_at" timestamp with time zone,
	CONSTRAINT "reading_conflicts_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
CREATE TABLE "sites" (
	"organization_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"time_zone" text NOT NULL,
	"floor_area_m2" numeric(12, 2),
	"degree_day_base_c" numeric(4, 1) DEFAULT '15.5' NOT NULL,
	"address" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"archived_at" timestamp with time zone,
	CONSTRAINT "sites_organization_id_id_pk" PRIMARY KEY("organization_id","id")
);
--> statement-breakpoint
ALTER TABLE "ingest_batches" ADD CONSTRAINT "ingest_batches_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "meters" ADD CONSTRAINT "meters_organization_id_site_id_sites_organization_id_id_fk" FOREIGN KEY ("organization_id","site_id") REFERENCES "public"."sites"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "meters" ADD CONSTRAINT "meters_organization_id_parent_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","parent_meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "meters" ADD CONSTRAINT "meters_organization_id_replaced_by_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","replaced_by_meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sites" ADD CONSTRAINT "sites_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "meters_code_unique" ON "meters" USING btree ("organization_id","code");--> statement-breakpoint
CREATE INDEX "meters_site_idx" ON "meters" USING btree ("organization_id","site_id");--> statement-breakpoint
CREATE INDEX "reading_conflicts_meter_idx" ON "reading_conflicts" USING btree ("organization_id","meter_id");--> statement-breakpoint
CREATE UNIQUE INDEX "sites_name_unique" ON "sites" USING btree ("organization_id",lower("name"));
--> statement-breakpoint
-- Hand-written: foreign keys and monthly partitions of the interval data.
ALTER TABLE "raw_readings" ADD CONSTRAINT "raw_readings_meter_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "intervals" ADD CONSTRAINT "intervals_meter_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "reading_conflicts" ADD CONSTRAINT "reading_conflicts_meter_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade;--> statement-breakpoint
CREATE OR REPLACE FUNCTION ensure_month_partitions(from_ts timestamptz, to_ts timestamptz)
RETURNS void LANGUAGE plpgsql AS $$
DECLARE
  month_start timestamptz := date_trunc('month', from_ts, 'UTC');
  suffix text;
BEGIN
  -- Serialise partition creation: two ingests of a new month must not race.
  PERFORM pg_advisory_xact_lock(20261201);
  WHILE month_start <= to_ts LOOP
    suffix := to_char(month_start AT TIME ZONE 'UTC', 'YYYY_MM');
    EXECUTE format(
      'CREATE TABLE IF NOT EXISTS %I PARTITION OF raw_readings FOR VALUES FROM (%L) TO (%L)',
      'raw_readings_' || suffix, month_start, month_start + interval '1 month');
    EXECUTE format(
      'CREATE TABLE IF NOT EXISTS %I PARTITION OF intervals FOR VALUES FROM (%L) TO (%L)',
      'intervals_' || suffix, month_start, month_start + interval '1 month');
    month_start := month_start + interval '1 month';
  END LOOP;
END;
$$;
