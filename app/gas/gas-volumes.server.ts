/**
 * The volumes behind series-priced gas intervals (gas_interval_volumes),
 * written in the batch's transaction beside the intervals themselves.
 */
import type { PoolClient } from "pg";
import type { GasPiece } from "./gas-intervals";

// Raw SQL, on purpose: written inside the readings transaction on its pg
// client, beside the interval statements (docs/architecture.md, "Data access").

interface VolumeRow {
  meterId: string;
  start: number;
  volumeM3: number;
  cvMjM3: number | null;
  energyKwh: number;
}

function columns(rows: VolumeRow[]) {
  return [
    rows.map((r) => r.meterId),
    rows.map((r) => new Date(r.start).toISOString()),
    rows.map((r) => r.volumeM3.toFixed(9)),
    rows.map((r) => (r.cvMjM3 === null ? null : String(r.cvMjM3))),
    rows.map((r) => r.energyKwh.toFixed(6)),
  ];
}

const INPUT = `unnest($2::uuid[], $3::timestamptz[], $4::numeric[], $5::numeric[], $6::numeric[])
                 as u(m, h, v, cv, k)`;

/**
 * Interval readings add into their intervals, so their volumes add too.
 * Pieces of one interval share its day, and so its CV.
 */
export async function addGasVolumes(
  client: PoolClient,
  organizationId: string,
  readings: readonly { meter: { id: string }; gasPieces?: GasPiece[] }[],
): Promise<void> {
  const byKey = new Map<string, VolumeRow>();
  for (const r of readings) {
    for (const p of r.gasPieces ?? []) {
      const key = `${r.meter.id}|${p.start}`;
      const row = byKey.get(key);
      if (row) {
        row.volumeM3 += p.volumeM3;
        row.energyKwh += p.energyKwh;
      } else byKey.set(key, { meterId: r.meter.id, ...p });
    }
  }
  if (byKey.size === 0) return;
  const rows = [...byKey.values()].sort((a, b) =>
    a.meterId === b.meterId
      ? a.start - b.start
      : a.meterId < b.meterId
        ? -1
        : 1,
  );
  await client.query(
    `insert into gas_interval_volumes as g
       (organization_id, meter_id, interval_start, volume_m3, calorific_value_mj_m3, energy_kwh)
     select $1, m, h, v, cv, k from ${INPUT}
     on conflict (organization_id, meter_id, interval_start) do update set
       volume_m3 = g.volume_m3 + excluded.volume_m3,
       calorific_value_mj_m3 = excluded.calorific_value_mj_m3,
       energy_kwh = g.energy_kwh + excluded.energy_kwh`,
    [organizationId, ...columns(rows)],
  );
}

/** A register meter's recomputed intervals replace their volumes. */
export async function replaceGasVolumes(
  client: PoolClient,
  organizationId: string,
  meterId: string,
  pieces: readonly GasPiece[],
): Promise<void> {
  if (pieces.length === 0) return;
  const rows = [...pieces]
    .sort((a, b) => a.start - b.start)
    .map((p) => ({ meterId, ...p }));
  await client.query(
    `insert into gas_interval_volumes as g
       (organization_id, meter_id, interval_start, volume_m3, calorific_value_mj_m3, energy_kwh)
     select $1, m, h, v, cv, k from ${INPUT}
     on conflict (organization_id, meter_id, interval_start) do update set
       volume_m3 = excluded.volume_m3,
       calorific_value_mj_m3 = excluded.calorific_value_mj_m3,
       energy_kwh = excluded.energy_kwh`,
    [organizationId, ...columns(rows)],
  );
}
