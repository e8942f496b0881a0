/**
 * Exergy's write path (design.md, "Fuels, hydrogen and exergy"): each heat
 * or cooling interval measured with flow and return temperatures keeps its
 * heat Q and entropy S (interval_exergy), and each meter's month sums
 * Q − T₀·S over its measured intervals whose site-local day has an outdoor
 * mean T₀ (monthly_exergy), with how many intervals that was.
 *
 * A batch of readings moves its months by exact differences (numeric):
 * each interval it touches gives its month (new − old) contribution, so the
 * month is never read back whole inside ingest. Weather and edits change
 * what every interval of a day or month counts, so there the months are
 * recomputed. Either way the months' rows are locked first, in key order,
 * and read in a later statement, whose snapshot then holds whatever a
 * concurrent writer of the same month (weather, another batch) committed.
 *
 * Raw SQL through drizzle's `sql`, like the rest of the write path, so that
 * a pg client (ingest) and a drizzle transaction (weather) can both run it.
 */
import { sql, type SQL } from "drizzle-orm";
import { drizzle } from "drizzle-orm/node-postgres";
import type { PoolClient } from "pg";
import type { PreparedReading } from "~/ingest/prepare-readings.server";
import { named } from "~/ingest/named-statement.server";
import { exergyPieces } from "./exergy-pieces";

/** Anything that runs a drizzle `sql` statement: db, a transaction. */
export interface SqlRunner {
  execute(query: SQL): Promise<unknown>;
}

/** A pg client of the ingest path, as a runner in its transaction. */
export function runnerOf(client: PoolClient): SqlRunner {
  return drizzle(client);
}

/**
 * Each interval's exergy at its day's mean, when the dead state makes it
 * useful, with its site-local month. $8 and $9 bound the intervals (the
 * batch's first and last), so that only their partitions are probed.
 */
const CONTRIBUTION = `
  select e.meter_id, date_trunc('month', e.interval_start at time zone s.time_zone)::date as month,
         e.heat_kwh - (w.mean_temp_c + 273.15) * e.entropy_kwh_per_k as exergy
    from %EXERGY% e
    join meters m on m.organization_id = $1 and m.id = e.meter_id
    join sites s on s.organization_id = m.organization_id and s.id = m.site_id
    -- Only what was measured: an estimate or a person's edit replaced
    -- the readings' energy, and their exergy with it.
    join intervals i
      on i.organization_id = $1 and i.meter_id = e.meter_id
     and i.interval_start = e.interval_start and i.quality = 'measured'
     and i.interval_start >= $8 and i.interval_start <= $9
    join daily_weather w
      on w.organization_id = $1 and w.site_id = s.id
     and w.day = (e.interval_start at time zone s.time_zone)::date
   where case when e.heating then w.mean_temp_c < e.flow_limit_c
              else w.mean_temp_c > e.flow_limit_c end`;

/**
 * Adds the pieces to interval_exergy and answers, per touched month, the
 * difference its intervals make, in one statement: \`before\` reads the
 * pieces' intervals as the statement's snapshot has them (before the
 * upsert), \`after\` as the upsert leaves them. Their intervals' quality is
 * read once: a batch never changes it for an interval that already has
 * exergy (measured stays measured, an edit stands; only an estimate or a
 * gap turns measured, and those have no exergy yet), so the difference is
 * the pieces' alone. PostgreSQL numeric adds and multiplies exactly, so the
 * months stay equal to a recompute digit for digit. It also answers the
 * outdoor means it used, for applyReadingsExergy to check.
 */
const ADD_PIECES = `with u as (
    select m, h, sum(q) as q, sum(s) as s,
           case when bool_and(w) = bool_or(w)
                then case when bool_and(w) then min(f) else max(f) end end as f,
           bool_and(w) as w
      from unnest($2::uuid[], $3::timestamptz[], $4::numeric[], $5::numeric[], $6::numeric[], $7::boolean[])
           as u(m, h, q, s, f, w)
     group by m, h
  ), before as (
    select e.* from interval_exergy e join u on e.meter_id = u.m and e.interval_start = u.h
     where e.organization_id = $1
  ), after as (
    -- Readings sharing an interval add, as their energies do in \`intervals\`;
    -- the limit on T₀ is the stricter of theirs, or none when they disagree
    -- on the direction (no exergy for a mixed interval).
    insert into interval_exergy as e
      (organization_id, meter_id, interval_start, heat_kwh, entropy_kwh_per_k, flow_limit_c, heating)
    select $1, m, h, q, s, f, w from u order by m, h
    on conflict (organization_id, meter_id, interval_start) do update set
      heat_kwh = e.heat_kwh + excluded.heat_kwh,
      entropy_kwh_per_k = e.entropy_kwh_per_k + excluded.entropy_kwh_per_k,
      flow_limit_c = case when e.heating = excluded.heating then
          case when e.heating then least(e.flow_limit_c, excluded.flow_limit_c)
               else greatest(e.flow_limit_c, excluded.flow_limit_c) end end,
      heating = e.heating and excluded.heating
    returning e.*
  ), diff as materialized (
    select meter_id, month, exergy, 1 as n from (${CONTRIBUTION.replace("%EXERGY%", "after")}) a
    union all
    select meter_id, month, -exergy, -1 from (${CONTRIBUTION.replace("%EXERGY%", "before")}) b
  ), sums as (
    select meter_id, month, sum(exergy) as exergy, sum(n)::int as n from diff group by 1, 2
  ), keys as materialized (
    select u.m as meter_id, s.id as site_id,
           date_trunc('month', u.h at time zone s.time_zone)::date as month,
           (u.h at time zone s.time_zone)::date as day
      from u
      join meters m on m.organization_id = $1 and m.id = u.m
      join sites s on s.organization_id = m.organization_id and s.id = m.site_id
  ), months as (
    select distinct meter_id, month from keys
  ), days as (
    select distinct site_id, day from keys
  )
  select (select json_agg(json_build_object(
                  'meterId', mo.meter_id, 'month', mo.month,
                  'exergyKwh', coalesce(s.exergy, 0)::text, 'intervals', coalesce(s.n, 0))
                order by mo.meter_id, mo.month)
            from months mo left join sums s using (meter_id, month)) as months,
         (select json_agg(json_build_object('siteId', d.site_id, 'day', d.day, 'meanTempC', w.mean_temp_c::text))
            from days d
            left join daily_weather w on w.organization_id = $1 and w.site_id = d.site_id and w.day = d.day) as weather`;

/** Creates or locks, in key order, the months a batch moves. */
const LOCK_MONTHS = `insert into monthly_exergy (organization_id, meter_id, month)
  select $1, m, mo from unnest($2::uuid[], $3::date[]) as u(m, mo) order by m, mo
  on conflict (organization_id, meter_id, month) do update set updated_at = now()`;

/**
 * Adds the months' differences, unless an outdoor mean they were computed
 * with has changed since (weather committed in between): then nothing, and
 * the caller recomputes those months.
 */
const ADD_TO_MONTHS = `with changed as (
    select 1 from unnest($5::uuid[], $6::date[], $7::numeric[]) as f(site_id, day, t)
      left join daily_weather w on w.organization_id = $1 and w.site_id = f.site_id and w.day = f.day
     where w.mean_temp_c is distinct from f.t
     limit 1
  ), added as (
    update monthly_exergy me
       set exergy_exact_kwh = me.exergy_exact_kwh + d.x,
           exergy_kwh = round(me.exergy_exact_kwh + d.x, 6),
           intervals = me.intervals + d.n, updated_at = now()
      from unnest($2::uuid[], $3::date[], $4::numeric[], $8::int[]) as d(m, mo, x, n)
     where me.organization_id = $1 and me.meter_id = d.m and me.month = d.mo
       and (d.x <> 0 or d.n <> 0) and not exists (select 1 from changed)
    returning 1
  )
  select exists (select 1 from changed) as weather_changed`;

/** What a batch's exergy does to its months, and the outdoor means that says it with. */
export interface ReadingsExergy {
  months: {
    meterId: string;
    month: string;
    exergyKwh: string;
    intervals: number;
  }[];
  weather: { siteId: string; day: string; meanTempC: string | null }[];
  meterIds: string[];
  from: Date;
  to: Date;
}

/**
 * The batch's water_heat readings into interval_exergy, with what their
 * months gain; takes no lock another batch waits for (the intervals are
 * already this batch's), so it runs before the rollups.
 */
export async function addReadingsExergy(
  client: PoolClient,
  organizationId: string,
  readings: readonly PreparedReading[],
): Promise<ReadingsExergy | null> {
  const p = exergyPieces(readings);
  if (p.meterIds.length === 0) return null;
  const times = p.starts.map((s) => Date.parse(s));
  const from = new Date(Math.min(...times));
  const to = new Date(Math.max(...times));
  const { rows } = await client.query<
    Omit<ReadingsExergy, "meterIds" | "from" | "to">
  >({
    ...named(ADD_PIECES),
    values: [
      organizationId,
      p.meterIds,
      p.starts,
      p.heats,
      p.entropies,
      p.flowLimits,
      p.heating,
      from,
      to,
    ],
  });
  return { ...rows[0], meterIds: [...new Set(p.meterIds)], from, to };
}

/**
 * After the rollups: locks the months (key order), then adds what they
 * gained. Locking first means a weather write either committed before (its
 * means are seen, and the differences no longer hold: the months are
 * recomputed) or waits for this commit and recomputes after it.
 */
export async function applyReadingsExergy(
  client: PoolClient,
  organizationId: string,
  exergy: ReadingsExergy | null,
): Promise<void> {
  if (!exergy) return;
  const { months, weather } = exergy;
  await client.query({
    ...named(LOCK_MONTHS),
    values: [
      organizationId,
      months.map((m) => m.meterId),
      months.map((m) => m.month),
    ],
  });
  const { rows } = await client.query<{ weather_changed: boolean }>({
    ...named(ADD_TO_MONTHS),
    values: [
      organizationId,
      months.map((m) => m.meterId),
      months.map((m) => m.month),
      months.map((m) => m.exergyKwh),
      weather.map((w) => w.siteId),
      weather.map((w) => w.day),
      weather.map((w) => w.meanTempC),
      months.map((m) => m.intervals),
    ],
  });
  if (rows[0].weather_changed)
    await recomputeMeters(runnerOf(client), organizationId, exergy);
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
       set exergy_exact_kwh = sums.exergy, exergy_kwh = round(sums.exergy, 6),
         intervals = sums.n, updated_at = now()
      from sums
     where me.organization_id = ${organizationId}::uuid
       and me.meter_id = sums.meter_id and me.month = sums.month`);
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
