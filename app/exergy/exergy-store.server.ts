/**
 * Exergy's write path (design.md, "Fuels, hydrogen and exergy"): each heat
 * or cooling interval measured with flow and return temperatures keeps its
 * heat Q and entropy S (interval_exergy), and each meter's month sums
 * Q − T₀·S over its measured intervals whose site-local day has an outdoor
 * mean T₀ (monthly_exergy), with how many intervals that was.
 *
 * The month is recomputed, not added to, because the weather moves it too:
 * after a batch of readings (in the batch's transaction) and after weather
 * for a site arrives (in the weather's transaction). Its rows are locked
 * first, in key order, and summed in the next statement, whose snapshot then
 * holds whatever a concurrent writer of the same month committed.
 *
 * Raw SQL through drizzle's `sql`, like the rest of the write path, so that
 * a pg client (ingest) and a drizzle transaction (weather) can both run it.
 */
import { sql, type SQL } from "drizzle-orm";
import { drizzle } from "drizzle-orm/node-postgres";
import type { PoolClient } from "pg";
import type { PreparedReading } from "~/ingest/prepare-readings.server";
import { exergyPieces } from "./exergy-pieces";

/** Anything that runs a drizzle `sql` statement: db, a transaction. */
export interface SqlRunner {
  execute(query: SQL): Promise<unknown>;
}

/** A pg client of the ingest path, as a runner in its transaction. */
export function runnerOf(client: PoolClient): SqlRunner {
  return drizzle(client);
}

/** Adds the readings' pieces to interval_exergy; returns the meters and span touched. */
async function addPieces(
  runner: SqlRunner,
  organizationId: string,
  readings: readonly PreparedReading[],
): Promise<{ meterIds: string[]; from: Date; to: Date } | null> {
  const p = exergyPieces(readings);
  if (p.meterIds.length === 0) return null;
  // Arrays go as one parameter each (sql.param), not as drizzle's lists.
  // Readings sharing an interval add, as their energies do in `intervals`;
  // the limit on T₀ is the stricter of theirs, or none when they disagree
  // on the direction (no exergy for a mixed interval).
  await runner.execute(sql`
    insert into interval_exergy as e
      (organization_id, meter_id, interval_start, heat_kwh, entropy_kwh_per_k, flow_limit_c, heating)
    select ${organizationId}::uuid, m, h, sum(q), sum(s),
           case when bool_and(w) = bool_or(w)
                then case when bool_and(w) then min(f) else max(f) end end,
           bool_and(w)
      from unnest(${sql.param(p.meterIds)}::uuid[], ${sql.param(p.starts)}::timestamptz[], ${sql.param(p.heats)}::numeric[],
                  ${sql.param(p.entropies)}::numeric[], ${sql.param(p.flowLimits)}::numeric[], ${sql.param(p.heating)}::boolean[])
           as u(m, h, q, s, f, w)
     group by m, h
     order by m, h
    on conflict (organization_id, meter_id, interval_start) do update set
      heat_kwh = e.heat_kwh + excluded.heat_kwh,
      entropy_kwh_per_k = e.entropy_kwh_per_k + excluded.entropy_kwh_per_k,
      flow_limit_c = case when e.heating = excluded.heating then
          case when e.heating then least(e.flow_limit_c, excluded.flow_limit_c)
               else greatest(e.flow_limit_c, excluded.flow_limit_c) end end,
      heating = e.heating and excluded.heating`);
  const times = p.starts.map((s) => Date.parse(s));
  return {
    meterIds: [...new Set(p.meterIds)],
    from: new Date(Math.min(...times)),
    to: new Date(Math.max(...times)),
  };
}

/**
 * The (meter, site-local month) pairs to recompute, with the month's bounds
 * in UTC: `meters` filters the meters, `first`/`last` give the months in
 * the site's local time (they may use `s.time_zone`).
 */
function monthsOf(
  organizationId: string,
  meters: SQL,
  first: SQL,
  last: SQL,
): SQL {
  return sql`
    select m.id as meter_id, s.id as site_id, s.time_zone, mo::date as month,
           mo at time zone s.time_zone as lo,
           (mo + interval '1 month') at time zone s.time_zone as hi
      from meters m
      join sites s on s.organization_id = m.organization_id and s.id = m.site_id
     cross join lateral generate_series(${first}, ${last}, interval '1 month') as mo
     where m.organization_id = ${organizationId}::uuid and ${meters}`;
}

async function recompute(
  runner: SqlRunner,
  organizationId: string,
  months: SQL,
): Promise<void> {
  // Lock (or create) the months' rows in key order first…
  await runner.execute(sql`
    with months as (${months})
    insert into monthly_exergy (organization_id, meter_id, month)
    select ${organizationId}::uuid, meter_id, month from months order by meter_id, month
    on conflict (organization_id, meter_id, month) do update set updated_at = now()`);
  // …then sum them in a statement that sees every committed interval.
  await runner.execute(sql`
    with months as (${months}),
    sums as (
      select mo.meter_id, mo.month,
             coalesce(sum(x.heat_kwh - (x.t0 + 273.15) * x.entropy_kwh_per_k) filter (where x.useful), 0) as exergy,
             count(*) filter (where x.useful) as n
        from months mo
        left join lateral (
          select e.heat_kwh, e.entropy_kwh_per_k, w.mean_temp_c as t0,
                 coalesce(case when e.heating then w.mean_temp_c < e.flow_limit_c
                               else w.mean_temp_c > e.flow_limit_c end, false) as useful
            from interval_exergy e
            -- Only what was measured: an estimate or a person's edit replaced
            -- the readings' energy, and their exergy with it.
            join intervals i
              on i.organization_id = e.organization_id and i.meter_id = e.meter_id
             and i.interval_start = e.interval_start and i.quality = 'measured'
             and i.interval_start >= mo.lo and i.interval_start < mo.hi
            left join daily_weather w
              on w.organization_id = e.organization_id and w.site_id = mo.site_id
             and w.day = (e.interval_start at time zone mo.time_zone)::date
           where e.organization_id = ${organizationId}::uuid and e.meter_id = mo.meter_id
             and e.interval_start >= mo.lo and e.interval_start < mo.hi
        ) x on true
       group by mo.meter_id, mo.month
    )
    update monthly_exergy me
       set exergy_kwh = sums.exergy, intervals = sums.n, updated_at = now()
      from sums
     where me.organization_id = ${organizationId}::uuid
       and me.meter_id = sums.meter_id and me.month = sums.month`);
}

/** After a batch's intervals are written: its water_heat readings' exergy. */
export async function storeReadingsExergy(
  client: PoolClient,
  organizationId: string,
  readings: readonly PreparedReading[],
): Promise<void> {
  const runner = runnerOf(client);
  const touched = await addPieces(runner, organizationId, readings);
  if (!touched) return;
  await recomputeMeters(runner, organizationId, touched);
}

/** Only meters with any interval exergy get a month of it. */
const hasExergy = sql`exists (
  select 1 from interval_exergy e
   where e.organization_id = m.organization_id and e.meter_id = m.id)`;

/** Recomputes the months of `meterIds` from `from` to `to` (UTC instants). */
export function recomputeMeters(
  runner: SqlRunner,
  organizationId: string,
  range: { meterIds: readonly string[]; from: Date; to: Date },
): Promise<void> {
  const ids = [...range.meterIds];
  return recompute(
    runner,
    organizationId,
    monthsOf(
      organizationId,
      sql`m.id = any(${sql.param(ids)}::uuid[]) and ${hasExergy}`,
      sql`date_trunc('month', ${range.from.toISOString()}::timestamptz at time zone s.time_zone)`,
      sql`date_trunc('month', ${range.to.toISOString()}::timestamptz at time zone s.time_zone)`,
    ),
  );
}

/**
 * After a site's weather for the days `from` to `to` (YYYY-MM-DD) is stored:
 * the months of its meters that have exergy to give.
 */
export function recomputeSiteWeather(
  runner: SqlRunner,
  args: { organizationId: string; siteId: string; from: string; to: string },
): Promise<void> {
  return recompute(
    runner,
    args.organizationId,
    monthsOf(
      args.organizationId,
      sql`m.site_id = ${args.siteId}::uuid and ${hasExergy}`,
      sql`date_trunc('month', ${args.from}::date::timestamp)`,
      sql`date_trunc('month', ${args.to}::date::timestamp)`,
    ),
  );
}
