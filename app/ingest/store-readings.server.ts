/**
 * The write path of ingest, in one transaction on one connection: raw
 * readings (idempotent on meter and time), conflicts kept for review, the
 * hourly intervals derived from what was new, and the monthly rollups moved
 * by exactly what the hours gained. Set-based statements over arrays keep a
 * batch to a handful of round trips, whatever its size.
 *
 * Locks are always taken in the same order (register meters, raw readings,
 * intervals, rollups; each by sorted key), so concurrent batches on the same
 * meters wait for each other but never deadlock.
 */
import type { PoolClient } from "pg";
import { addGasVolumes } from "~/gas/gas-volumes.server";
import {
  applyRollupDeltas,
  type ChangeAttribution,
  type RollupDelta,
} from "~/ledger/refresh-rollups.server";
import {
  addReadingsExergy,
  applyReadingsExergy,
} from "~/exergy/exergy-store.server";
import { intervalPieces } from "./interval-pieces";
import { named } from "./named-statement.server";
import { ensurePartitions } from "./partitions.server";
import type { PreparedReading, Rejection } from "./prepare-readings.server";
import {
  lockRegisterMeters,
  recomputeRegisterSpan,
  type RegisterMeterSpan,
} from "./register-hours.server";
import { writeIntervals } from "./write-intervals.server";

// Raw SQL, on purpose: the batch write path, measured by `npm run bench readings`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

export interface StoreOutcome {
  accepted: number;
  repeats: number;
  conflicts: Rejection[];
  /** Meters whose intervals changed, with the hours touched (for estimation). */
  touched: Map<string, { from: Date; to: Date }>;
}

type Range = { from: Date; to: Date };

const keyOf = (meterId: string, time: Date) => `${meterId}|${time.getTime()}`;

function timeRange(readings: PreparedReading[]): Range {
  let min = Infinity;
  let max = -Infinity;
  for (const r of readings) {
    min = Math.min(min, r.readingTime.getTime());
    max = Math.max(max, (r.endTime ?? r.readingTime).getTime());
  }
  return { from: new Date(min), to: new Date(max) };
}

/**
 * Inserts what is new in key order; answers the readings that were already
 * stored. The payloads travel as one JSON array: one parse, and no escaping
 * of every quote as an array literal would need.
 */
const INSERT_RAW = `with u as (
       select * from rows from (
           unnest($3::int[]), unnest($4::uuid[]), unnest($5::timestamptz[]), unnest($6::timestamptz[]),
           jsonb_array_elements($7::jsonb), unnest($8::text[]), unnest($9::numeric[]), unnest($10::numeric[]),
           unnest($11::numeric[]))
         as u(i, m, t, e, p, h, k, r, x)
     ), ins as (
       insert into raw_readings
         (organization_id, meter_id, reading_time, end_time, payload, payload_hash, energy_kwh, register_kwh, uncertainty_kwh, batch_id)
       select $1, m, t, e, p, h, k, r, x, $2 from u order by m, t
       on conflict do nothing
       returning meter_id, reading_time
     )
     select u.i from u
      where not exists (select 1 from ins where ins.meter_id = u.m and ins.reading_time = u.t)`;

/** Returns the readings already stored (by another batch, perhaps one committing now). */
async function insertRaw(
  client: PoolClient,
  organizationId: string,
  batchId: string,
  rows: PreparedReading[],
): Promise<PreparedReading[]> {
  const { rows: stored } = await client.query<{ i: number }>({
    ...named(INSERT_RAW),
    values: [
      organizationId,
      batchId,
      rows.map((_, i) => i),
      rows.map((r) => r.meter.id),
      rows.map((r) => r.readingTime.toISOString()),
      rows.map((r) => r.endTime?.toISOString() ?? null),
      JSON.stringify(rows.map((r) => r.payload)),
      rows.map((r) => r.payloadHash),
      rows.map((r) => r.energyKwh),
      rows.map((r) => r.registerKwh),
      rows.map((r) => r.uncertaintyKwh),
    ],
  });
  return stored.map(({ i }) => rows[i]);
}

async function storedHashes(
  client: PoolClient,
  organizationId: string,
  rows: PreparedReading[],
) {
  if (rows.length === 0) return new Map<string, string>();
  const { rows: found } = await client.query<{
    meter_id: string;
    reading_time: Date;
    payload_hash: string;
  }>(
    `select r.meter_id, r.reading_time, r.payload_hash
       from raw_readings r
       join unnest($2::uuid[], $3::timestamptz[]) as u(m, t) on r.meter_id = u.m and r.reading_time = u.t
      where r.organization_id = $1`,
    [
      organizationId,
      rows.map((r) => r.meter.id),
      rows.map((r) => r.readingTime),
    ],
  );
  return new Map(
    found.map((f) => [keyOf(f.meter_id, f.reading_time), f.payload_hash]),
  );
}

async function recordConflicts(
  client: PoolClient,
  organizationId: string,
  batchId: string,
  rows: PreparedReading[],
) {
  if (rows.length === 0) return;
  await client.query(
    `insert into reading_conflicts (organization_id, meter_id, reading_time, payload, batch_id)
     select $1, m, t, p, $2 from unnest($3::uuid[], $4::timestamptz[], $5::jsonb[]) as u(m, t, p)`,
    [
      organizationId,
      batchId,
      rows.map((r) => r.meter.id),
      rows.map((r) => r.readingTime),
      rows.map((r) => JSON.stringify(r.payload)),
    ],
  );
}

const PIECES = `unnest($2::uuid[], $3::timestamptz[], $4::numeric[], $5::timestamptz[], $6::numeric[])
                as p(m, h, k, t, x)`;

/**
 * Interval readings add into their meter's intervals. An estimate is replaced
 * by what was measured; a human edit stands, flagged that data arrived after it.
 */
function addIntervalReadings(
  client: PoolClient,
  organizationId: string,
  rows: PreparedReading[],
): Promise<RollupDelta[]> {
  const p = intervalPieces(rows);
  return writeIntervals(client, organizationId, {
    // Intervals shared by several readings are summed first; usually each
    // has one reading and the grouping would only cost time.
    input: p.shared
      ? `select m, h, sum(k) as k, sum(x) as x, array_agg(t order by t) as ts from ${PIECES} group by m, h`
      : `select m, h, k, x, array[t] as ts from ${PIECES}`,
    params: [p.meterIds, p.starts, p.energies, p.readingTimes, p.bands],
    insertColumns: "energy_kwh, uncertainty_kwh, quality, source_reading_times",
    insertValues: "u.k, u.x, 'measured', u.ts",
    update: `energy_kwh = case
         when i.quality = 'edited' then i.energy_kwh
         when i.quality in ('estimated', 'missing') then u.k
         else i.energy_kwh + u.k end,
       uncertainty_kwh = case
         when i.quality = 'edited' then i.uncertainty_kwh
         when i.quality in ('estimated', 'missing') then u.x
         else i.uncertainty_kwh + u.x end,
       quality = case when i.quality = 'edited' then 'edited'::interval_quality else 'measured' end,
       flags = case when i.quality = 'edited'
         then array(select distinct unnest(i.flags || '{late_data_after_edit}'))
         else i.flags end,
       estimate_method = case when i.quality = 'edited' then i.estimate_method end,
       source_reading_times = case when i.quality in ('estimated', 'missing')
         then u.ts else i.source_reading_times || u.ts end`,
    from: new Date(p.from),
    to: new Date(p.to),
  });
}

function classifyRepeats(
  candidates: PreparedReading[],
  existing: Map<string, string>,
) {
  const repeats: PreparedReading[] = [];
  const conflicts: PreparedReading[] = [];
  for (const r of candidates) {
    const hash = existing.get(keyOf(r.meter.id, r.readingTime));
    if (hash === r.payloadHash) repeats.push(r);
    else conflicts.push(r);
  }
  return { repeats, conflicts };
}

/** Key order (meter, then time), as PostgreSQL sorts uuid and timestamptz. */
function byKey(a: PreparedReading, b: PreparedReading): number {
  if (a.meter.id !== b.meter.id) return a.meter.id < b.meter.id ? -1 : 1;
  return a.readingTime.getTime() - b.readingTime.getTime();
}

/**
 * Splits a batch into first occurrences and in-batch duplicates of a key;
 * the first occurrences come in key order, which the statements keep anyway
 * (lock order), so PostgreSQL's sorts find them sorted.
 */
function firstOccurrences(readings: PreparedReading[]) {
  const seen = new Set<string>();
  const first: PreparedReading[] = [];
  const later: PreparedReading[] = [];
  for (const r of readings) {
    const key = keyOf(r.meter.id, r.readingTime);
    if (seen.has(key)) later.push(r);
    else {
      seen.add(key);
      first.push(r);
    }
  }
  return { first: first.sort(byKey), later };
}

function widen(
  touched: Map<string, Range>,
  meterId: string,
  from: Date,
  to: Date,
) {
  const t = touched.get(meterId);
  touched.set(meterId, {
    from: t && t.from < from ? t.from : from,
    to: t && t.to > to ? t.to : to,
  });
}

function registerSpans(fresh: PreparedReading[]): RegisterMeterSpan[] {
  const spans = new Map<string, RegisterMeterSpan>();
  for (const r of fresh.filter((f) => f.registerKwh !== null)) {
    const span = spans.get(r.meter.id) ?? {
      meter: r.meter,
      times: [],
      gas: r.gas,
    };
    span.times.push(r.readingTime);
    spans.set(r.meter.id, span);
  }
  // In meter order, like the advisory locks and every other key.
  return [...spans.values()].sort((a, b) =>
    a.meter.id < b.meter.id ? -1 : a.meter.id > b.meter.id ? 1 : 0,
  );
}

/** The new readings' hours; returns what the rollups gain. */
async function deriveHours(
  client: PoolClient,
  organizationId: string,
  fresh: PreparedReading[],
  touched: Map<string, Range>,
): Promise<RollupDelta[]> {
  const intervalReadings = fresh.filter((r) => r.energyKwh !== null);
  const deltas = intervalReadings.length
    ? await addIntervalReadings(client, organizationId, intervalReadings)
    : [];
  // The volumes behind gas intervals priced by their supply's CVs, so that
  // a CV entered later recomputes them (app/gas).
  await addGasVolumes(
    client,
    organizationId,
    intervalReadings.filter((r) => r.gasPieces),
  );
  for (const span of registerSpans(fresh)) {
    const range = await recomputeRegisterSpan(client, organizationId, span);
    widen(touched, span.meter.id, range.from, range.to);
    deltas.push(...range.deltas);
  }
  for (const r of fresh)
    widen(touched, r.meter.id, r.readingTime, r.endTime ?? r.readingTime);
  return deltas;
}

export async function storeReadings(
  client: PoolClient,
  organizationId: string,
  batchId: string,
  readings: PreparedReading[],
  change: ChangeAttribution,
): Promise<StoreOutcome> {
  const touched = new Map<string, Range>();
  if (readings.length === 0)
    return { accepted: 0, repeats: 0, conflicts: [], touched };
  const range = timeRange(readings);
  await ensurePartitions(client, range.from, range.to);
  await lockRegisterMeters(client, readings);
  const { first, later } = firstOccurrences(readings);
  const alreadyStored = await insertRaw(client, organizationId, batchId, first);
  const notFresh = new Set([...alreadyStored, ...later]);
  const fresh = first.filter((r) => !notFresh.has(r));
  const { repeats, conflicts } = classifyRepeats(
    [...notFresh],
    await storedHashes(client, organizationId, [...notFresh]),
  );
  await recordConflicts(client, organizationId, batchId, conflicts);
  const deltas = await deriveHours(client, organizationId, fresh, touched);
  // Exergy beside the energy, for water_heat readings (app/exergy): the
  // intervals' part now, while this batch waits for no other…
  const exergy = await addReadingsExergy(client, organizationId, fresh);
  // …then the months, which concurrent batches share: from their first lock
  // to the commit, batches on the same months go one at a time, so only
  // small statements run there. The ledger's monthly rollups move in the
  // same transaction as the hours.
  await applyRollupDeltas(client, organizationId, deltas, change);
  await applyReadingsExergy(client, organizationId, exergy);
  return {
    accepted: fresh.length,
    repeats: repeats.length,
    conflicts: conflicts.map((r) => ({
      index: r.index,
      meter: r.meter.code,
      reason: `conflict: a different reading for ${r.meter.code} at ${r.readingTime.toISOString()} is already stored; kept for review, not applied`,
    })),
    touched,
  };
}
