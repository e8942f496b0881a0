-- interval_exergy and gas_interval_volumes keep one row per meter interval,
-- as intervals does, so they are range-partitioned by month (UTC) on
-- interval_start the same way (0001): a month's rows live in one partition,
-- and a distributed PostgreSQL can shard them by organization_id like the
-- intervals beside them (docs/scaling.md). Each table is rebuilt partitioned
-- under its own name, constraints and all, and its rows moved across.
ALTER TABLE "interval_exergy" RENAME TO "interval_exergy_unpartitioned";--> statement-breakpoint
ALTER TABLE "interval_exergy_unpartitioned" RENAME CONSTRAINT "interval_exergy_organization_id_meter_id_interval_start_pk" TO "interval_exergy_unpartitioned_pk";--> statement-breakpoint
ALTER TABLE "interval_exergy_unpartitioned" DROP CONSTRAINT "interval_exergy_organization_id_meter_id_meters_organization_id_id_fk";--> statement-breakpoint
CREATE TABLE "interval_exergy" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"interval_start" timestamp with time zone NOT NULL,
	"heat_kwh" numeric(24, 9) NOT NULL,
	"entropy_kwh_per_k" numeric(24, 12) NOT NULL,
	"flow_limit_c" numeric(7, 3),
	"heating" boolean NOT NULL,
	CONSTRAINT "interval_exergy_organization_id_meter_id_interval_start_pk" PRIMARY KEY("organization_id","meter_id","interval_start")
) PARTITION BY RANGE ("interval_start");--> statement-breakpoint
ALTER TABLE "interval_exergy" ADD CONSTRAINT "interval_exergy_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gas_interval_volumes" RENAME TO "gas_interval_volumes_unpartitioned";--> statement-breakpoint
ALTER TABLE "gas_interval_volumes_unpartitioned" RENAME CONSTRAINT "gas_interval_volumes_organization_id_meter_id_interval_start_pk" TO "gas_interval_volumes_unpartitioned_pk";--> statement-breakpoint
ALTER TABLE "gas_interval_volumes_unpartitioned" DROP CONSTRAINT "gas_interval_volumes_organization_id_meter_id_meters_organization_id_id_fk";--> statement-breakpoint
CREATE TABLE "gas_interval_volumes" (
	"organization_id" uuid NOT NULL,
	"meter_id" uuid NOT NULL,
	"interval_start" timestamp with time zone NOT NULL,
	"volume_m3" numeric(24, 9) NOT NULL,
	"calorific_value_mj_m3" numeric(7, 4),
	"energy_kwh" numeric(20, 6) NOT NULL,
	CONSTRAINT "gas_interval_volumes_organization_id_meter_id_interval_start_pk" PRIMARY KEY("organization_id","meter_id","interval_start")
) PARTITION BY RANGE ("interval_start");--> statement-breakpoint
ALTER TABLE "gas_interval_volumes" ADD CONSTRAINT "gas_interval_volumes_organization_id_meter_id_meters_organization_id_id_fk" FOREIGN KEY ("organization_id","meter_id") REFERENCES "public"."meters"("organization_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
-- The one function that makes monthly partitions now makes them for all four
-- interval tables; app/ingest/partitions.server.ts calls it when any is missing.
CREATE OR REPLACE FUNCTION ensure_month_partitions(from_ts timestamptz, to_ts timestamptz)
RETURNS void LANGUAGE plpgsql AS $$
DECLARE
  month_start timestamptz := date_trunc('month', from_ts, 'UTC');
  suffix text;
  parent text;
BEGIN
  -- Serialise partition creation: two ingests of a new month must not race.
  PERFORM pg_advisory_xact_lock(20261201);
  WHILE month_start <= to_ts LOOP
    suffix := to_char(month_start AT TIME ZONE 'UTC', 'YYYY_MM');
    FOREACH parent IN ARRAY ARRAY['raw_readings', 'intervals', 'interval_exergy', 'gas_interval_volumes'] LOOP
      EXECUTE format(
        'CREATE TABLE IF NOT EXISTS %I PARTITION OF %I FOR VALUES FROM (%L) TO (%L)',
        parent || '_' || suffix, parent, month_start, month_start + interval '1 month');
    END LOOP;
    month_start := month_start + interval '1 month';
  END LOOP;
END;
$$;--> statement-breakpoint
-- Every month that already has interval partitions gets the new tables' too,
-- so the rows below find theirs and later writes find them in place.
SELECT ensure_month_partitions(m.start, m.start)
  FROM pg_inherits i
  JOIN pg_class c ON c.oid = i.inhrelid
 CROSS JOIN LATERAL (SELECT make_timestamptz(substr(c.relname, 11, 4)::int, substr(c.relname, 16, 2)::int, 1, 0, 0, 0, 'UTC') AS start) m
 WHERE i.inhparent = 'intervals'::regclass AND c.relname ~ '^intervals_\d{4}_\d{2}$';--> statement-breakpoint
SELECT ensure_month_partitions(min("interval_start"), max("interval_start")) FROM "interval_exergy_unpartitioned" HAVING count(*) > 0;--> statement-breakpoint
SELECT ensure_month_partitions(min("interval_start"), max("interval_start")) FROM "gas_interval_volumes_unpartitioned" HAVING count(*) > 0;--> statement-breakpoint
INSERT INTO "interval_exergy" SELECT * FROM "interval_exergy_unpartitioned";--> statement-breakpoint
INSERT INTO "gas_interval_volumes" SELECT * FROM "gas_interval_volumes_unpartitioned";--> statement-breakpoint
DROP TABLE "interval_exergy_unpartitioned";--> statement-breakpoint
DROP TABLE "gas_interval_volumes_unpartitioned";
