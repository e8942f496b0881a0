/**
 * Hour counts per meter over a report's period, in one query: each meter's
 * window is the period in its site's time zone, cut to when it was installed
 * and removed and to the time of generation. A meter's intervals count as
 * their length in hours (a half-hour as 0.5), whatever its resolution.
 *
 * Without reading a year of intervals: a site-local month wholly inside the
 * window whose rollup (monthly_rollups, exact) holds every interval slot of
 * the month, none estimated, and which has no edited interval (the partial
 * index intervals_edited_idx) is all measured, so it contributes its slots
 * and, as measured points, only its first and last slot: no gap lies inside
 * it, and a gap that crosses its edge is measured from those points. Only
 * the other months (gaps, estimates, edits, and the window's cut edges) read
 * their intervals. The figures equal those of reading every interval
 * (tests/integration/report-content.test.ts keeps that query as reference).
 * Slots are the meter's interval starts (multiples of its interval in UTC)
 * in [month start, next month start) in the site's zone, so DST months and
 * zones whose midnight falls between two hours count right.
 */
import { addDays, subDays } from "date-fns";
import type pg from "pg";
import { pool } from "~/db/client.server";
import type { ReportPeriod } from "../periods";
import type { MeterHourCounts } from "./data-quality";
import type { Orientation } from "~/sites/meter-kinds";
import type { Carrier } from "./types";

// Raw SQL, on purpose: one of loadReportData's loads, measured by `npm run bench reports`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

/**
 * The period in UTC widened by a day each side (every site's zone lies
 * within ±14 h of UTC), as constants. The month bounds in the query are
 * computed per site at run time, so PostgreSQL would plan every monthly
 * partition of intervals; with these it prunes to the period's partitions
 * while planning, which was most of the query's cost.
 */
function partitionBounds(period: ReportPeriod): [Date, Date] {
  return [
    subDays(new Date(`${period.start}T00:00:00Z`), 1),
    addDays(new Date(`${period.end}T00:00:00Z`), 1),
  ];
}

export async function meterHourCounts(
  args: {
    organizationId: string;
    siteId: string | null;
    period: ReportPeriod;
    generatedAt: Date;
  },
  readPool: pg.Pool = pool,
): Promise<MeterHourCounts[]> {
  const { rows } = await readPool.query<{
    site_name: string;
    code: string;
    name: string;
    carrier: Carrier;
    orientation: Orientation;
    sub_meter: boolean;
    retired: boolean;
    t0: Date;
    t1: Date;
    measured: number;
    estimated: number;
    edited: number;
    first_measured: Date | null;
    last_measured: Date | null;
    longest_gap: number | null;
    conflicts: number;
    open_conflicts: number;
  }>(
    `with live as (
      select m.id, m.interval_minutes, m.code, m.name, m.carrier::text as carrier, m.orientation::text as orientation,
             m.parent_meter_id is not null as sub_meter, m.removed_at is not null as retired,
             s.name as site_name, s.time_zone,
             greatest(($2::date)::timestamp at time zone s.time_zone, m.installed_at) as t0,
             least(($3::date)::timestamp at time zone s.time_zone,
                   coalesce(m.removed_at, 'infinity'::timestamptz), $5::timestamptz) as t1
        from meters m
        join sites s on s.organization_id = m.organization_id and s.id = m.site_id
       where m.organization_id = $1 and ($4::uuid is null or s.id = $4::uuid)
    ), months as (
      -- Each site-local month of the period, cut to the meter's window; its interval slots.
      select l.id, mo::date as month, l.interval_minutes / 60.0 as length,
             b.lo, b.hi, greatest(b.lo, l.t0) as a, least(b.hi, l.t1) as z,
             ceil(extract(epoch from b.lo) / (l.interval_minutes * 60)) as first_slot,
             ceil(extract(epoch from b.hi) / (l.interval_minutes * 60)) as end_slot,
             l.interval_minutes * 60 as step
        from live l
       cross join generate_series($2::date::timestamp, $3::date::timestamp - interval '1 month', interval '1 month') as mo
       cross join lateral (select mo at time zone l.time_zone as lo,
                                  (mo + interval '1 month') at time zone l.time_zone as hi) b
       where l.t1 > l.t0 and greatest(b.lo, l.t0) < least(b.hi, l.t1)
    ), checked as (
      select k.*,
             coalesce(k.a = k.lo and k.z = k.hi
                      and r.hours = k.end_slot - k.first_slot and r.estimated_hours = 0, false)
             and not exists (select 1 from intervals e
                              where e.organization_id = $1 and e.meter_id = k.id and e.quality = 'edited'
                                and e.interval_start >= $6 and e.interval_start < $7
                                and e.interval_start >= k.lo and e.interval_start < k.hi) as complete
        from months k
        left join monthly_rollups r on r.organization_id = $1 and r.meter_id = k.id and r.month = k.month
    ), points as (
      select c.id, c.length, to_timestamp(c.first_slot * c.step) as interval_start, 'measured' as quality,
             0::numeric as n, false as month_end
        from checked c where c.complete
      union all
      select c.id, c.length, to_timestamp((c.end_slot - 1) * c.step), 'measured',
             (c.end_slot - c.first_slot) * c.length, true
        from checked c where c.complete
      union all
      -- Lateral, so each month is an index range scan of its own partition.
      select c.id, c.length, i.interval_start, i.quality, c.length, false
        from checked c
       cross join lateral (
             select i.interval_start, i.quality::text as quality
               from intervals i
              where i.organization_id = $1 and i.meter_id = c.id
                and i.interval_start >= $6 and i.interval_start < $7
                and i.interval_start >= c.a and i.interval_start < c.z
             offset 0) i
       where not c.complete
    ), hours as (
      select id, interval_start, quality, length, n,
             -- A complete month's last slot follows its first: no gap between them.
             case when quality = 'measured' and not month_end
                  then interval_start - lag(interval_start) over (
                         partition by id, quality = 'measured' order by interval_start)
             end as step
        from points
    ), counts as (
      select id,
             coalesce(sum(n) filter (where quality = 'measured'), 0)::float8 as measured,
             coalesce(sum(n) filter (where quality = 'estimated'), 0)::float8 as estimated,
             coalesce(sum(n) filter (where quality = 'edited'), 0)::float8 as edited,
             min(interval_start) filter (where quality = 'measured') as first_measured,
             max(interval_start) filter (where quality = 'measured') as last_measured,
             max(extract(epoch from step) / 3600 - length)::float8 as longest_gap
        from hours group by id
    ), conflicts as (
      select c.meter_id as id, count(*)::int as conflicts,
             count(*) filter (where c.resolved_at is null)::int as open_conflicts
        from reading_conflicts c
        join live l on l.id = c.meter_id
       where c.organization_id = $1
         and c.reading_time < l.t1 and c.reading_time >= l.t0
       group by c.meter_id
    )
    select l.site_name, l.code, l.name, l.carrier, l.orientation, l.sub_meter, l.retired,
           l.t0, l.t1,
           coalesce(k.measured, 0) as measured, coalesce(k.estimated, 0) as estimated,
           coalesce(k.edited, 0) as edited, k.first_measured, k.last_measured, k.longest_gap,
           coalesce(c.conflicts, 0) as conflicts, coalesce(c.open_conflicts, 0) as open_conflicts
      from live l
      left join counts k on k.id = l.id
      left join conflicts c on c.id = l.id
     where l.t1 > l.t0
     order by l.site_name, l.sub_meter, l.code`,
    [
      args.organizationId,
      args.period.start,
      args.period.end,
      args.siteId,
      args.generatedAt,
      ...partitionBounds(args.period),
    ],
  );
  return rows.map((r) => ({
    siteName: r.site_name,
    code: r.code,
    name: r.name,
    carrier: r.carrier,
    orientation: r.orientation,
    subMeter: r.sub_meter,
    retired: r.retired,
    from: r.t0,
    to: r.t1,
    measured: r.measured,
    estimated: r.estimated,
    edited: r.edited,
    firstMeasured: r.first_measured,
    lastMeasured: r.last_measured,
    longestInnerGapHours: Math.max(0, r.longest_gap ?? 0),
    conflicts: r.conflicts,
    openConflicts: r.open_conflicts,
  }));
}
