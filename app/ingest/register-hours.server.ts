/**
 * Register reads → the meter's intervals (15, 30 or 60 minutes). A register
 * read changes the deltas on both sides of it, so the intervals between its
 * neighbours are recomputed from all reads that touch them (late reads
 * included) and replaced, not added.
 */
import type { PoolClient } from "pg";
import {
  priceByDay,
  registerVolumeM3,
  type GasMeterContext,
  type GasPiece,
} from "~/gas/gas-intervals";
import { replaceGasVolumes } from "~/gas/gas-volumes.server";
import type { RollupDelta } from "~/ledger/refresh-rollups.server";
import { floorToStep, splitAcrossIntervals, stepMsOf } from "./hours";
import { siteSign, type PreparedReading } from "./prepare-readings.server";
import { registerDeltas } from "./register-series";
import { writeIntervals } from "./write-intervals.server";

// Raw SQL, on purpose: register reads turned into hours inside the batch transaction, measured by `npm run bench readings`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

type Meter = PreparedReading["meter"];

export interface RegisterMeterSpan {
  meter: Meter;
  times: Date[];
  /** A gas register: its advances are volumes, priced by the supply's CVs. */
  gas?: GasMeterContext;
}

interface RegisterHour {
  energy: number;
  flags: Set<string>;
  spread: boolean;
  sources: Date[];
}

/**
 * Two batches for one register meter at once would each recompute deltas
 * without the other's reads; they take turns per meter (ordered, so two
 * batches never wait on each other in a cycle).
 */
export async function lockRegisterMeters(
  client: PoolClient,
  readings: PreparedReading[],
): Promise<void> {
  // A gas meter priced by its CV series is locked too: a CV change
  // recomputes its intervals under the same lock (app/gas).
  const ids = [
    ...new Set(
      readings
        .filter((r) => r.registerKwh !== null || r.gasPieces)
        .map((r) => r.meter.id),
    ),
  ].sort();
  for (const id of ids) {
    await client.query("select pg_advisory_xact_lock(hashtext($1))", [id]);
  }
}

async function neighbours(
  client: PoolClient,
  organizationId: string,
  meterId: string,
  lo: Date,
  hi: Date,
) {
  const { rows } = await client.query<{
    prev: Date | null;
    next: Date | null;
  }>(
    `select (select max(reading_time) from raw_readings where organization_id = $1 and meter_id = $2 and reading_time < $3) as prev,
            (select min(reading_time) from raw_readings where organization_id = $1 and meter_id = $2 and reading_time > $4) as next`,
    [organizationId, meterId, lo, hi],
  );
  return rows[0];
}

async function readsAround(
  client: PoolClient,
  organizationId: string,
  meterId: string,
  from: Date,
  to: Date,
) {
  const { rows } = await client.query<{
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
    [organizationId, meterId, from, to],
  );
  return rows.map((r) => ({
    time: r.reading_time,
    registerKwh: Number(r.register_kwh),
  }));
}

/** The recomputed intervals in [from, to), keyed by interval start (ms). */
function hoursFromDeltas(
  meter: Meter,
  deltas: ReturnType<typeof registerDeltas>,
  from: Date,
  to: Date,
): Map<number, RegisterHour> {
  const sign = siteSign(meter);
  const stepMs = stepMsOf(meter);
  const hours = new Map<number, RegisterHour>();
  for (const d of deltas) {
    const spread = d.to.getTime() - d.from.getTime() > stepMs;
    const pieces = splitAcrossIntervals(
      d.from,
      d.to,
      d.energyKwh * sign,
      stepMs,
    );
    for (const piece of pieces) {
      const t = piece.intervalStart.getTime();
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
      const last = floorToStep(new Date(d.to.getTime() - 1), stepMs);
      if (d.flag && last.getTime() === t) hour.flags.add(d.flag);
      hours.set(t, hour);
    }
  }
  return hours;
}

/**
 * A gas register's hours hold register advances (× multiplier); each becomes
 * a volume at reference conditions and the energy of its day's CV. An hour
 * whose day has no CV yet keeps its volume and 0 kWh, flagged cv_pending,
 * until the CV is entered (app/gas/calorific-values.server.ts).
 */
function priceGasHours(
  hours: Map<number, RegisterHour>,
  gas: GasMeterContext,
): GasPiece[] {
  const pieces = priceByDay(
    [...hours.entries()].map(([start, h]) => ({
      start,
      volumeM3: registerVolumeM3(h.energy, gas.settings),
    })),
    gas,
  );
  for (const p of pieces) {
    const hour = hours.get(p.start)!;
    hour.energy = p.energyKwh;
    if (p.cvMjM3 === null) hour.flags.add("cv_pending");
  }
  return pieces;
}

/** Replaces the hours; a person's edit stands, flagged that data came after it. */
function replaceHours(
  client: PoolClient,
  organizationId: string,
  meter: Meter,
  hours: Map<number, RegisterHour>,
): Promise<RollupDelta[]> {
  const entries = [...hours.entries()].sort(([a], [b]) => a - b);
  return writeIntervals(client, organizationId, {
    input: `select $2::uuid as m, h, k, q::interval_quality as q, string_to_array(f, ',') as f, em,
                   string_to_array(s, ',')::timestamptz[] as s
              from unnest($3::timestamptz[], $4::numeric[], $5::text[], $6::text[], $7::text[], $8::text[])
                as p(h, k, q, f, em, s)`,
    params: [
      meter.id,
      entries.map(([t]) => new Date(t).toISOString()),
      entries.map(([, h]) => h.energy.toFixed(6)),
      // A delta over several intervals is spread evenly: the total is
      // measured, its split between the intervals is an estimate.
      entries.map(([, h]) => (h.spread ? "estimated" : "measured")),
      entries.map(([, h]) => [...h.flags].join(",")),
      entries.map(([, h]) => (h.spread ? "register_spread" : null)),
      entries.map(([, h]) => h.sources.map((s) => s.toISOString()).join(",")),
    ],
    insertColumns:
      "energy_kwh, quality, flags, estimate_method, source_reading_times",
    insertValues: "u.k, u.q, u.f, u.em, u.s",
    update: `energy_kwh = case when i.quality = 'edited' then i.energy_kwh else u.k end,
       quality = case when i.quality = 'edited' then i.quality else u.q end,
       flags = case when i.quality = 'edited'
         then array(select distinct unnest(i.flags || '{late_data_after_edit}'))
         else u.f end,
       estimate_method = case when i.quality = 'edited' then i.estimate_method else u.em end,
       source_reading_times = u.s`,
    from: new Date(entries[0][0]),
    to: new Date(entries[entries.length - 1][0]),
  });
}

/**
 * Recomputes the hours between the neighbours of a meter's new reads; returns
 * the hours touched (for estimation) and what the rollups gain.
 */
export async function recomputeRegisterSpan(
  client: PoolClient,
  organizationId: string,
  span: RegisterMeterSpan,
): Promise<{ from: Date; to: Date; deltas: RollupDelta[] }> {
  const lo = new Date(Math.min(...span.times.map((t) => t.getTime())));
  const hi = new Date(Math.max(...span.times.map((t) => t.getTime())));
  const bounds = await neighbours(
    client,
    organizationId,
    span.meter.id,
    lo,
    hi,
  );
  const stepMs = stepMsOf(span.meter);
  const from = floorToStep(bounds.prev ?? lo, stepMs);
  const to = new Date(
    floorToStep(bounds.next ?? hi, stepMs).getTime() + stepMs,
  );
  const reads = await readsAround(
    client,
    organizationId,
    span.meter.id,
    from,
    to,
  );
  const deltas = registerDeltas(reads, {
    multiplier: Number(span.meter.multiplier),
    capacityKwh:
      span.meter.rolloverKwh === null
        ? undefined
        : Number(span.meter.rolloverKwh),
  });
  const hours = hoursFromDeltas(span.meter, deltas, from, to);
  const gasPieces = span.gas ? priceGasHours(hours, span.gas) : [];
  const changes = hours.size
    ? await replaceHours(client, organizationId, span.meter, hours)
    : [];
  if (span.gas)
    await replaceGasVolumes(client, organizationId, span.meter.id, gasPieces);
  // The hours touched end at the last read: a delta ends there (exclusive).
  return { from, to: bounds.next ?? hi, deltas: changes };
}
