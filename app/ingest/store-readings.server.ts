/**
 * The write path of ingest, in one transaction on one connection: raw
 * readings (idempotent on meter and time), conflicts kept for review, and the
 * hourly intervals derived from what was new. Plain SQL with unnest() keeps a
 * 5,000-reading batch to a handful of round trips.
 */
import type { PoolClient } from "pg";
import { splitAcrossHours, floorToHour, HOUR_MS } from "./hours";
import { registerDeltas } from "./register-series";
import {
  refreshRollups,
  type ChangeAttribution,
} from "~/ledger/refresh-rollups.server";
import type { PreparedReading, Rejection } from "./prepare-readings.server";

export interface StoreOutcome {
  accepted: number;
  repeats: number;
  conflicts: Rejection[];
  /** Meters whose intervals changed, with the hours touched (for estimation). */
  touched: Map<string, { from: Date; to: Date }>;
}

const keyOf = (meterId: string, time: Date) => `${meterId}|${time.getTime()}`;

async function ensurePartitions(
  client: PoolClient,
  readings: PreparedReading[],
) {
  let min = Infinity;
  let max = -Infinity;
  for (const r of readings) {
    min = Math.min(min, r.readingTime.getTime());
    max = Math.max(max, (r.endTime ?? r.readingTime).getTime());
  }
  await client.query("select ensure_month_partitions($1, $2)", [
    new Date(min),
    new Date(max),
  ]);
}

/** Inserts what is new; returns the keys that were stored by this call. */
async function insertRaw(
  client: PoolClient,
  organizationId: string,
  batchId: string,
  rows: PreparedReading[],
): Promise<Set<string>> {
  const { rows: inserted } = await client.query<{
    meter_id: string;
    reading_time: Date;
  }>(
    `insert into raw_readings
       (organization_id, meter_id, reading_time, end_time, payload, payload_hash, energy_kwh, register_kwh, uncertainty_kwh, batch_id)
     select $1, m, t, e, p, h, k, r, x, $2
       from unnest($3::uuid[], $4::timestamptz[], $5::timestamptz[], $6::jsonb[], $7::text[], $8::numeric[], $9::numeric[], $10::numeric[])
         as u(m, t, e, p, h, k, r, x)
     on conflict do nothing
     returning meter_id, reading_time`,
    [
      organizationId,
      batchId,
      rows.map((r) => r.meter.id),
      rows.map((r) => r.readingTime),
      rows.map((r) => r.endTime),
      rows.map((r) => JSON.stringify(r.payload)),
      rows.map((r) => r.payloadHash),
      rows.map((r) => r.energyKwh),
      rows.map((r) => r.registerKwh),
      rows.map((r) => r.uncertaintyKwh),
    ],
  );
  return new Set(inserted.map((r) => keyOf(r.meter_id, r.reading_time)));
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

interface HourRow {
  meterId: string;
  hourStart: Date;
  energyKwh: string;
  uncertaintyKwh: string;
  readingTime: Date;
}

/** A reading's energy and its MPE band, split over its hours alike (by time). */
function hourPieces(r: PreparedReading): HourRow[] {
  const energy = splitAcrossHours(
    r.readingTime,
    r.endTime!,
    Number(r.energyKwh),
  );
  const band = splitAcrossHours(
    r.readingTime,
    r.endTime!,
    Number(r.uncertaintyKwh ?? 0),
  );
  return energy.map((p, i) => ({
    meterId: r.meter.id,
    hourStart: p.hourStart,
    energyKwh: p.energyKwh.toFixed(6),
    uncertaintyKwh: band[i].energyKwh.toFixed(6),
    readingTime: r.readingTime,
  }));
}

/**
 * Interval readings add into their hours. An estimate is replaced by what was
 * measured; a human edit stands, flagged that data arrived after it.
 */
async function addIntervalReadings(
  client: PoolClient,
  organizationId: string,
  rows: PreparedReading[],
) {
  const pieces = rows.flatMap(hourPieces);
  if (pieces.length === 0) return;
  await client.query(
    `insert into intervals (organization_id, meter_id, hour_start, energy_kwh, uncertainty_kwh, quality, source_reading_times)
     select $1, m, h, sum(k), sum(x), 'measured', array_agg(t order by t)
       from unnest($2::uuid[], $3::timestamptz[], $4::numeric[], $5::timestamptz[], $6::numeric[]) as u(m, h, k, t, x)
      group by m, h
     on conflict (organization_id, meter_id, hour_start) do update set
       energy_kwh = case
         when intervals.quality = 'edited' then intervals.energy_kwh
         when intervals.quality in ('estimated', 'missing') then excluded.energy_kwh
         else intervals.energy_kwh + excluded.energy_kwh end,
       uncertainty_kwh = case
         when intervals.quality = 'edited' then intervals.uncertainty_kwh
         when intervals.quality in ('estimated', 'missing') then excluded.uncertainty_kwh
         else intervals.uncertainty_kwh + excluded.uncertainty_kwh end,
       quality = case when intervals.quality = 'edited' then 'edited'::interval_quality else 'measured' end,
       flags = case when intervals.quality = 'edited'
         then array(select distinct unnest(intervals.flags || '{late_data_after_edit}'))
         else intervals.flags end,
       estimate_method = case when intervals.quality = 'edited' then intervals.estimate_method end,
       source_reading_times = case when intervals.quality in ('estimated', 'missing')
         then excluded.source_reading_times
         else intervals.source_reading_times || excluded.source_reading_times end,
       updated_at = now()`,
    [
      organizationId,
      pieces.map((p) => p.meterId),
      pieces.map((p) => p.hourStart),
      pieces.map((p) => p.energyKwh),
      pieces.map((p) => p.readingTime),
      pieces.map((p) => p.uncertaintyKwh),
    ],
  );
}

interface RegisterMeterSpan {
  meter: PreparedReading["meter"];
  times: Date[];
}

/**
 * A register read changes the deltas on both sides of it, so the hours
 * between its neighbours are recomputed from all reads that touch them (late
 * reads included) and replaced, not added.
 */
async function recomputeRegisterSpan(
  client: PoolClient,
  organizationId: string,
  span: RegisterMeterSpan,
): Promise<{ from: Date; to: Date }> {
  const lo = new Date(Math.min(...span.times.map((t) => t.getTime())));
  const hi = new Date(Math.max(...span.times.map((t) => t.getTime())));
  const { rows: bounds } = await client.query<{
    prev: Date | null;
    next: Date | null;
  }>(
    `select (select max(reading_time) from raw_readings where organization_id = $1 and meter_id = $2 and reading_time < $3) as prev,
            (select min(reading_time) from raw_readings where organization_id = $1 and meter_id = $2 and reading_time > $4) as next`,
    [organizationId, span.meter.id, lo, hi],
  );
  const from = floorToHour(bounds[0].prev ?? lo);
  const to = new Date(floorToHour(bounds[0].next ?? hi).getTime() + HOUR_MS);
  const { rows: reads } = await client.query<{
    reading_time: Date;
    register_kwh: string;
  }>(
    `select reading_time, register_kwh from raw_readings
      where organization_id = $1 and meter_id = $2
        and reading_time >= coalesce((select max(reading_time) from raw_readings
                                       where organization_id = $1 and meter_id = $2 and reading_time < $3), $3)
        and reading_time <= coalesce((select min(reading_time) from raw_readings
                                       where organization_id = $1 and meter_id = $2 and reading_time > $4), $4)
      order by reading_time`,
    [organizationId, span.meter.id, from, to],
  );
  const deltas = registerDeltas(
    reads.map((r) => ({
      time: r.reading_time,
      registerKwh: Number(r.register_kwh),
    })),
    {
      multiplier: Number(span.meter.multiplier),
      capacityKwh:
        span.meter.rolloverKwh === null
          ? undefined
          : Number(span.meter.rolloverKwh),
    },
  );
  await replaceRegisterHours(
    client,
    organizationId,
    span.meter,
    deltas,
    from,
    to,
  );
  // The hours touched end at the last read: a delta ends there (exclusive).
  return { from, to: bounds[0].next ?? hi };
}

async function replaceRegisterHours(
  client: PoolClient,
  organizationId: string,
  meter: PreparedReading["meter"],
  deltas: ReturnType<typeof registerDeltas>,
  from: Date,
  to: Date,
) {
  const sign = meter.orientation === "export" ? -1 : 1;
  const hours = new Map<
    number,
    { energy: number; flags: Set<string>; spread: boolean; sources: Date[] }
  >();
  for (const d of deltas) {
    const spread = d.to.getTime() - d.from.getTime() > HOUR_MS;
    for (const piece of splitAcrossHours(d.from, d.to, d.energyKwh * sign)) {
      const t = piece.hourStart.getTime();
      if (t < from.getTime() || t >= to.getTime()) continue;
      const hour = hours.get(t) ?? {
        energy: 0,
        flags: new Set<string>(),
        spread: false,
        sources: [],
      };
      hour.energy += piece.energyKwh;
      hour.spread ||= spread;
      hour.sources.push(d.to);
      if (d.flag && floorToHour(new Date(d.to.getTime() - 1)).getTime() === t)
        hour.flags.add(d.flag);
      hours.set(t, hour);
    }
  }
  if (hours.size === 0) return;
  const entries = [...hours.entries()];
  await client.query(
    `insert into intervals (organization_id, meter_id, hour_start, energy_kwh, quality, flags, estimate_method, source_reading_times)
     select $1, $2, h, k, q::interval_quality, string_to_array(f, ','), em, string_to_array(s, ',')::timestamptz[]
       from unnest($3::timestamptz[], $4::numeric[], $5::text[], $6::text[], $7::text[], $8::text[]) as u(h, k, q, f, em, s)
     on conflict (organization_id, meter_id, hour_start) do update set
       energy_kwh = case when intervals.quality = 'edited' then intervals.energy_kwh else excluded.energy_kwh end,
       quality = case when intervals.quality = 'edited' then intervals.quality else excluded.quality end,
       flags = case when intervals.quality = 'edited'
         then array(select distinct unnest(intervals.flags || '{late_data_after_edit}'))
         else excluded.flags end,
       estimate_method = case when intervals.quality = 'edited' then intervals.estimate_method else excluded.estimate_method end,
       source_reading_times = excluded.source_reading_times,
       updated_at = now()`,
    [
      organizationId,
      meter.id,
      entries.map(([t]) => new Date(t)),
      entries.map(([, h]) => h.energy.toFixed(6)),
      // A delta over several hours is spread evenly: the total is measured,
      // its split between the hours is an estimate.
      entries.map(([, h]) => (h.spread ? "estimated" : "measured")),
      entries.map(([, h]) => [...h.flags].join(",")),
      entries.map(([, h]) => (h.spread ? "register_spread" : null)),
      entries.map(([, h]) => h.sources.map((s) => s.toISOString()).join(",")),
    ],
  );
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

/** Splits a batch into first occurrences and in-batch duplicates of a key. */
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
  return { first, later };
}

/**
 * Two batches for one register meter at once would each recompute deltas
 * without the other's reads; they take turns per meter (ordered, so two
 * batches never wait on each other in a cycle).
 */
async function lockRegisterMeters(
  client: PoolClient,
  readings: PreparedReading[],
) {
  const ids = [
    ...new Set(
      readings.filter((r) => r.registerKwh !== null).map((r) => r.meter.id),
    ),
  ].sort();
  for (const id of ids) {
    await client.query("select pg_advisory_xact_lock(hashtext($1))", [id]);
  }
}

function widen(
  touched: Map<string, { from: Date; to: Date }>,
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

export async function storeReadings(
  client: PoolClient,
  organizationId: string,
  batchId: string,
  readings: PreparedReading[],
  change: ChangeAttribution,
): Promise<StoreOutcome> {
  const touched = new Map<string, { from: Date; to: Date }>();
  if (readings.length === 0)
    return { accepted: 0, repeats: 0, conflicts: [], touched };
  await ensurePartitions(client, readings);
  await lockRegisterMeters(client, readings);
  const { first, later } = firstOccurrences(readings);
  const storedNow = await insertRaw(client, organizationId, batchId, first);
  const fresh = first.filter((r) =>
    storedNow.has(keyOf(r.meter.id, r.readingTime)),
  );
  const notFresh = [
    ...first.filter((r) => !storedNow.has(keyOf(r.meter.id, r.readingTime))),
    ...later,
  ];
  const { repeats, conflicts } = classifyRepeats(
    notFresh,
    await storedHashes(client, organizationId, notFresh),
  );
  await recordConflicts(client, organizationId, batchId, conflicts);
  await addIntervalReadings(
    client,
    organizationId,
    fresh.filter((r) => r.energyKwh !== null),
  );
  const registerSpans = new Map<string, RegisterMeterSpan>();
  for (const r of fresh.filter((f) => f.registerKwh !== null)) {
    const span = registerSpans.get(r.meter.id) ?? { meter: r.meter, times: [] };
    span.times.push(r.readingTime);
    registerSpans.set(r.meter.id, span);
  }
  for (const span of registerSpans.values()) {
    const range = await recomputeRegisterSpan(client, organizationId, span);
    widen(touched, span.meter.id, range.from, range.to);
  }
  for (const r of fresh)
    widen(touched, r.meter.id, r.readingTime, r.endTime ?? r.readingTime);
  // The ledger's monthly rollups move in the same transaction as the hours.
  for (const [meterId, range] of touched) {
    await refreshRollups(
      client,
      organizationId,
      meterId,
      range.from,
      range.to,
      change,
    );
  }
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
