ALTER TABLE "monthly_exergy" ADD COLUMN "exergy_exact_kwh" numeric DEFAULT '0' NOT NULL;--> statement-breakpoint
-- Existing months get their exact sum, as exergy-store.server.ts's recompute
-- computes it (measured intervals whose site-local day has a useful mean);
-- from here on ingest adds exact differences to it.
UPDATE "monthly_exergy" me SET "exergy_exact_kwh" = coalesce((
  SELECT sum(e.heat_kwh - (w.mean_temp_c + 273.15) * e.entropy_kwh_per_k)
    FROM meters m
    JOIN sites s ON s.organization_id = m.organization_id AND s.id = m.site_id
    JOIN interval_exergy e ON e.organization_id = m.organization_id AND e.meter_id = m.id
     AND e.interval_start >= me.month::timestamp AT TIME ZONE s.time_zone
     AND e.interval_start < (me.month + interval '1 month') AT TIME ZONE s.time_zone
    JOIN intervals i ON i.organization_id = e.organization_id AND i.meter_id = e.meter_id
     AND i.interval_start = e.interval_start AND i.quality = 'measured'
    JOIN daily_weather w ON w.organization_id = e.organization_id AND w.site_id = s.id
     AND w.day = (e.interval_start AT TIME ZONE s.time_zone)::date
   WHERE m.organization_id = me.organization_id AND m.id = me.meter_id
     AND CASE WHEN e.heating THEN w.mean_temp_c < e.flow_limit_c ELSE w.mean_temp_c > e.flow_limit_c END
), 0);
