/**
 * A batch's water_heat readings as pieces of their meters' intervals, for
 * interval_exergy: heat and entropy split over the intervals alike, by time,
 * as the reading's energy is (interval-pieces.ts). Pure.
 */
import { splitAcrossIntervals, stepMsOf } from "~/ingest/hours";
import type { PreparedReading } from "~/ingest/prepare-readings.server";

export interface ExergyPieces {
  meterIds: string[];
  starts: string[];
  /** kWh and kWh/K as numeric text. */
  heats: string[];
  entropies: string[];
  flowLimits: number[];
  heating: boolean[];
}

export function exergyPieces(rows: readonly PreparedReading[]): ExergyPieces {
  const out: ExergyPieces = {
    meterIds: [],
    starts: [],
    heats: [],
    entropies: [],
    flowLimits: [],
    heating: [],
  };
  for (const r of rows) {
    const basis = r.exergyBasis;
    if (!basis || !r.endTime) continue;
    const stepMs = stepMsOf(r.meter);
    const heat = splitAcrossIntervals(
      r.readingTime,
      r.endTime,
      basis.heatKwh,
      stepMs,
    );
    const entropy = splitAcrossIntervals(
      r.readingTime,
      r.endTime,
      basis.entropyKwhPerK,
      stepMs,
    );
    heat.forEach((piece, i) => {
      out.meterIds.push(r.meter.id);
      out.starts.push(piece.intervalStart.toISOString());
      out.heats.push(piece.energyKwh.toFixed(9));
      out.entropies.push(entropy[i].energyKwh.toFixed(12));
      out.flowLimits.push(basis.flowLimitC);
      out.heating.push(basis.heating);
    });
  }
  return out;
}
