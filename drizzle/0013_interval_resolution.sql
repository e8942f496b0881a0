ALTER TABLE "meters" ADD COLUMN "interval_minutes" smallint DEFAULT 60 NOT NULL;--> statement-breakpoint
ALTER TABLE "meters" ADD CONSTRAINT "meters_interval_minutes_check" CHECK ("meters"."interval_minutes" in (15, 30, 60));--> statement-breakpoint
-- Hand-written (#14): an interval is no longer always an hour. A rename on
-- the partitioned parent renames the column in every partition; no row is
-- rewritten, so every interval and every rollup stays exactly as it was, and
-- existing meters keep their 60 minutes (the column default above).
ALTER TABLE "intervals" RENAME COLUMN "hour_start" TO "interval_start";--> statement-breakpoint
ALTER TABLE "intervals" RENAME CONSTRAINT "intervals_organization_id_meter_id_hour_start_pk" TO "intervals_organization_id_meter_id_interval_start_pk";
