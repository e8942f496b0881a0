/**
 * Writes intervals (at any meter's resolution; "hour" below is any
 * interval) and reports exactly how each site-local month of each meter
 * changed, for the monthly rollups (applyRollupDeltas): sums, so exact for
 * 15- and 30-minute intervals as for hours.
 *
 * PostgreSQL 15 cannot return a row's old values from an upsert, so a write
 * is two statements:
 *
 *  1. claim: insert every hour in (meter, hour) order; an hour that is already
 *     stored is only marked (`updated_at = '-infinity'`, a value no committed
 *     row has) and so locked. New hours are final here: in the usual case,
 *     hours not seen before, this is the only statement.
 *  2. apply, only when something was marked: read the marked hours' values
 *     and update them in one statement (both see the same snapshot, so the
 *     read gives the values before the update), and return new − old.
 *
 * Every hour is locked before its old value is read, so the differences are
 * exact under concurrent batches; claims in key order keep two writers from
 * waiting on each other in a cycle. A marked row is never visible to another
 * transaction: apply replaces the mark before the commit, and a failure
 * rolls both back.
 */
import type { PoolClient } from "pg";
import type { RollupDelta } from "~/ledger/refresh-rollups.server";
import { named } from "./named-statement.server";

// Raw SQL, on purpose: the claim/apply pair of every interval write, measured by `npm run bench readings`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

export interface IntervalWrite {
  /**
   * A SELECT of the hours to write, one row per (m = meter, h = hour start)
   * plus the writer's own columns. $1 is the organisation; the writer's
   * parameters (`params`) are $2 onwards.
   */
  input: string;
  params: unknown[];
  /** Columns (after organisation, meter and hour) of an hour not stored yet… */
  insertColumns: string;
  /** …and their values, over the input row `u`. */
  insertValues: string;
  /** The SET list for a stored hour `i`, from the input row `u`. */
  update: string;
  /** Stored hours this write leaves alone, as a condition over `i` (locked, unchanged). */
  keep?: string;
  /** The first and last hour written, so only their partitions are read. */
  from: Date;
  to: Date;
}

const MARK = "'-infinity'::timestamptz";

/**
 * Per meter and site-local month, from per-hour differences in `d`. The
 * months' bounds are computed once per meter and the hours matched to them
 * by range: converting every hour to local time would cost more than the
 * write itself. $from and $to are the first and last hour written.
 */
function sumByMonth(from: string, to: string): string {
  return `, touched as materialized (
      select distinct meter_id from d
    ), months as materialized (
      select m.id as meter_id, mo::date as month,
             mo at time zone s.time_zone as lo, (mo + interval '1 month') at time zone s.time_zone as hi
        from meters m
        join sites s on s.organization_id = m.organization_id and s.id = m.site_id
       cross join lateral generate_series(
               date_trunc('month', ${from}::timestamptz at time zone s.time_zone),
               date_trunc('month', ${to}::timestamptz at time zone s.time_zone),
               interval '1 month') as mo
       where m.organization_id = $1 and m.id in (select meter_id from touched)
    )
    select months.meter_id, to_char(months.month, 'YYYY-MM-DD') as month,
           sum(d.energy)::text as energy_kwh, sum(d.estimated)::text as estimated_kwh,
           sum(d.uncertainty)::text as uncertainty_kwh, sum(d.hours)::int as hours,
           sum(d.estimated_hours)::int as estimated_hours, sum(d.marked)::int as marked
      from d join months on months.meter_id = d.meter_id and d.interval_start >= months.lo and d.interval_start < months.hi
     group by months.meter_id, months.month`;
}

/** $-placeholders of the range, after the organisation and the writer's parameters. */
function rangeParams(write: IntervalWrite) {
  return {
    from: `$${write.params.length + 2}`,
    to: `$${write.params.length + 3}`,
  };
}

type MonthChange = RollupDelta & { marked: number };

function claimSql(write: IntervalWrite): string {
  const { from, to } = rangeParams(write);
  return `with u as (${write.input}),
    claimed as (
      insert into intervals as i (organization_id, meter_id, interval_start, ${write.insertColumns})
      select $1, u.m, u.h, ${write.insertValues} from u order by u.m, u.h
      on conflict (organization_id, meter_id, interval_start) do update set updated_at = ${MARK}
      ${write.keep ? `where not (${write.keep})` : ""}
      returning i.meter_id, i.interval_start, i.energy_kwh, i.uncertainty_kwh, i.quality,
                i.updated_at = ${MARK} as marked
    ), d as (
      -- A marked hour changes in apply; here it only counts.
      select meter_id, interval_start,
             case when marked then 0 else energy_kwh end as energy,
             case when not marked and quality = 'estimated' then energy_kwh else 0 end as estimated,
             case when marked then 0 else uncertainty_kwh end as uncertainty,
             case when marked then 0 else 1 end as hours,
             case when not marked and quality = 'estimated' then 1 else 0 end as estimated_hours,
             marked::int as marked
        from claimed
    )${sumByMonth(from, to)}`;
}

function applySql(write: IntervalWrite): string {
  const { from, to } = rangeParams(write);
  const marked = `i.organization_id = $1 and i.meter_id = u.m and i.interval_start = u.h
     and i.updated_at = ${MARK} and i.interval_start >= ${from} and i.interval_start <= ${to}`;
  return `with u as (${write.input}),
    old as (
      select i.meter_id, i.interval_start, i.energy_kwh, i.uncertainty_kwh, i.quality
        from intervals i join u on ${marked}
    ), changed as (
      update intervals i set ${write.update}, updated_at = now()
        from u where ${marked}
      returning i.meter_id, i.interval_start, i.energy_kwh, i.uncertainty_kwh, i.quality
    ), d as (
      select c.meter_id, c.interval_start,
             c.energy_kwh - o.energy_kwh as energy,
             (case when c.quality = 'estimated' then c.energy_kwh else 0 end)
               - (case when o.quality = 'estimated' then o.energy_kwh else 0 end) as estimated,
             c.uncertainty_kwh - o.uncertainty_kwh as uncertainty,
             0 as hours,
             (c.quality = 'estimated')::int - (o.quality = 'estimated')::int as estimated_hours,
             1 as marked
        from changed c join old o using (meter_id, interval_start)
    )${sumByMonth(from, to)}`;
}

const total = (rows: MonthChange[]) => rows.reduce((n, r) => n + r.marked, 0);

const withoutMark = ({ marked: _marked, ...delta }: MonthChange): RollupDelta =>
  delta;

/** Writes the hours; returns what each touched month of each meter gained. */
export async function writeIntervals(
  client: PoolClient,
  organizationId: string,
  write: IntervalWrite,
): Promise<RollupDelta[]> {
  const params = [organizationId, ...write.params, write.from, write.to];
  const claimed = await client.query<MonthChange>({
    ...named(claimSql(write)),
    values: params,
  });
  const marked = total(claimed.rows);
  if (marked === 0) return claimed.rows.map(withoutMark);
  const applied = await client.query<MonthChange>({
    ...named(applySql(write)),
    values: params,
  });
  if (total(applied.rows) !== marked) {
    // Every marked hour must be rewritten, or the mark would be committed.
    throw new Error(
      `interval write: ${marked} stored hours claimed, ${total(applied.rows)} updated`,
    );
  }
  return [...claimed.rows, ...applied.rows].map(withoutMark);
}
