import type { Pool, PoolClient } from "pg";
import { and, arrayContains, eq, not, sql } from "drizzle-orm";
import { meterKey, siteOfMeter } from "~/db/conditions.server";
import { db, pool } from "~/db/client.server";
import { intervals, meters, sites } from "~/db/schema";
import { withTransaction } from "~/db/transaction.server";
import { applyRollupDeltas } from "~/ledger/refresh-rollups.server";
import { estimateGaps } from "./estimate";
import { stepMsOf } from "./hours";
import { ensurePartitions } from "./partitions.server";
import { detectNegative, detectSpikes, expectedSign } from "./validate";
import type { IntervalPoint, Quality } from "./series";
import { writeIntervals } from "./write-intervals.server";
import type { Orientation } from "~/sites/meter-kinds";

const WEEK_MS = 7 * 86_400_000;
/** Weeks of history loaded before a gap, for the weekday × hour profile. */
const PROFILE_WEEKS = 8;

interface MeterFacts {
  timeZone: string;
  intervalMinutes: number;
  spikeFactor: number;
  orientation: Orientation;
  carrier: string;
}

async function meterFacts(
  organizationId: string,
  meterId: string,
): Promise<MeterFacts | null> {
  const [facts] = await db
    .select({
      timeZone: sites.timeZone,
      intervalMinutes: meters.intervalMinutes,
      spikeFactor: meters.spikeFactor,
      orientation: meters.orientation,
      carrier: meters.carrier,
    })
    .from(meters)
    .innerJoin(sites, siteOfMeter)
    .where(meterKey(organizationId, meterId));
  return facts ? { ...facts, spikeFactor: Number(facts.spikeFactor) } : null;
}

/**
 * The window to look at: from the known hour before `from`, less the profile
 * history, to the known hour after `to`. A correction is judged against the
 * same window (edit-interval.server.ts).
 *
 * This and loadSeries are raw SQL on a pg client because they also run
 * inside an edit's transaction, on the client withTransaction gives; they
 * read intervals after every ingested batch, which `npm run bench readings`
 * measures.
 */
export async function windowFor(
  organizationId: string,
  meterId: string,
  from: Date,
  to: Date,
  db: Pool | PoolClient = pool,
) {
  const { rows } = await db.query<{
    before: Date | null;
    after: Date | null;
  }>(
    `select (select max(interval_start) from intervals where organization_id = $1 and meter_id = $2
               and interval_start < $3 and quality in ('measured', 'edited')) as before,
            (select min(interval_start) from intervals where organization_id = $1 and meter_id = $2
               and interval_start > $4 and quality in ('measured', 'edited')) as after`,
    [organizationId, meterId, from, to],
  );
  const start = new Date(
    (rows[0].before ?? from).getTime() - PROFILE_WEEKS * WEEK_MS,
  );
  return { start, end: rows[0].after ?? to };
}

export async function loadSeries(
  organizationId: string,
  meterId: string,
  start: Date,
  end: Date,
  db: Pool | PoolClient = pool,
): Promise<IntervalPoint[]> {
  const { rows } = await db.query<{
    interval_start: Date;
    energy_kwh: string;
    quality: Quality;
    estimate_method: string | null;
  }>(
    `select interval_start, energy_kwh, quality, estimate_method from intervals
      where organization_id = $1 and meter_id = $2 and interval_start >= $3 and interval_start <= $4
      order by interval_start`,
    [organizationId, meterId, start, end],
  );
  return rows.map((r) => ({
    intervalStart: r.interval_start,
    energyKwh: Number(r.energy_kwh),
    quality: r.quality,
    registerSpread: r.estimate_method === "register_spread",
  }));
}

type Estimate = { intervalStart: Date; energyKwh: number; method: string };

/**
 * Estimates go only where nothing known is stored (a measurement may have
 * arrived since the series was read); their rollups move in the same
 * transaction, so a month never disagrees with its hours.
 */
async function storeEstimates(
  organizationId: string,
  meterId: string,
  estimates: Estimate[],
): Promise<void> {
  if (estimates.length === 0) return;
  // A long gap has many hours: no spread into Math.min.
  const times = estimates.map((e) => e.intervalStart.getTime());
  const first = new Date(times.reduce((a, b) => Math.min(a, b)));
  const last = new Date(times.reduce((a, b) => Math.max(a, b)));
  // Raw SQL: the same interval and rollup writes as ingest, which
  // `npm run bench readings` chose over the query builder.
  await withTransaction(pool, async (client) => {
    await ensurePartitions(client, first, last);
    const deltas = await writeIntervals(client, organizationId, {
      input: `select $2::uuid as m, h, k, em
              from unnest($3::timestamptz[], $4::numeric[], $5::text[]) as p(h, k, em)`,
      params: [
        meterId,
        estimates.map((e) => e.intervalStart),
        estimates.map((e) => e.energyKwh.toFixed(6)),
        estimates.map((e) => e.method),
      ],
      insertColumns: "energy_kwh, quality, estimate_method",
      insertValues: "u.k, 'estimated', u.em",
      update: "energy_kwh = u.k, estimate_method = u.em",
      keep: "i.quality not in ('estimated', 'missing')",
      from: first,
      to: last,
    });
    await applyRollupDeltas(client, organizationId, deltas, {
      source: "estimate",
      reason: "gap estimates updated",
    });
  });
}

/**
 * Fills the meter's gaps around a changed range with marked estimates, at
 * the meter's resolution, and flags spikes (against its typical interval)
 * and wrong-sign intervals. Measured and edited hours are never
 * overwritten; a later measurement replaces an estimate (store-readings).
 */
export async function estimateMeter(
  organizationId: string,
  meterId: string,
  from: Date,
  to: Date,
): Promise<void> {
  const facts = await meterFacts(organizationId, meterId);
  if (!facts) return;
  const { start, end } = await windowFor(organizationId, meterId, from, to);
  const series = await loadSeries(organizationId, meterId, start, end);
  const estimates = estimateGaps(series, {
    stepMs: stepMsOf(facts),
    timeZone: facts.timeZone,
    profileWeeks: PROFILE_WEEKS,
  });
  await storeEstimates(organizationId, meterId, estimates);
  await flagHours(
    organizationId,
    meterId,
    "spike",
    detectSpikes(series, facts.spikeFactor),
  );
  await flagHours(
    organizationId,
    meterId,
    "wrong_sign",
    detectNegative(series, expectedSign(facts)),
  );
}

async function flagHours(
  organizationId: string,
  meterId: string,
  flag: string,
  points: IntervalPoint[],
) {
  if (points.length === 0) return;
  await db
    .update(intervals)
    .set({ flags: sql`array_append(${intervals.flags}, ${flag})` })
    .where(
      and(
        eq(intervals.organizationId, organizationId),
        eq(intervals.meterId, meterId),
        // One array parameter, however many hours a long gap flags.
        sql`${intervals.intervalStart} = any(${sql.param(points.map((p) => p.intervalStart))}::timestamptz[])`,
        not(arrayContains(intervals.flags, [flag])),
      ),
    );
}
