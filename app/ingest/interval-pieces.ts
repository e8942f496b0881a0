// A batch's interval readings as pieces of their meters' own intervals (15,
// 30 or 60 minutes), in the column arrays the intervals statement takes
// (store-readings.server.ts).

import { splitAcrossIntervals, stepMsOf } from "./hours";
import type { PreparedReading } from "./prepare-readings.server";

export interface IntervalPiece {
  /** Start of the meter's UTC interval, ms. */
  start: number;
  /** Signed kWh and ± kWh band, as numeric text with six decimals. */
  energy: string;
  band: string;
}

export interface IntervalPieces {
  meterIds: string[];
  starts: string[];
  energies: string[];
  readingTimes: string[];
  bands: string[];
  /** Whether two pieces fall in the same interval of a meter (then they add). */
  shared: boolean;
  from: number;
  to: number;
}

/**
 * A reading inside one of its meter's intervals is that interval's piece as
 * it is: the split would give back the same number, so its text goes
 * through unchanged. Longer readings are split over the meter's intervals.
 */
export function piecesOf(r: PreparedReading): IntervalPiece[] {
  // A gas reading priced by its supply's CVs comes with its pieces: each
  // interval's energy is its volume at its own day's CV (app/gas).
  if (r.gasPieces)
    return r.gasPieces.map((p) => ({
      start: p.start,
      energy: p.energyKwh.toFixed(6),
      band: "0.000000",
    }));
  const stepMs = stepMsOf(r.meter);
  const t = r.readingTime.getTime();
  const start = t - (t % stepMs);
  if (r.endTime!.getTime() <= start + stepMs) {
    return [
      {
        start,
        energy: r.energyKwh!,
        band: r.uncertaintyKwh ?? "0.000000",
      },
    ];
  }
  const energy = splitAcrossIntervals(
    r.readingTime,
    r.endTime!,
    Number(r.energyKwh),
    stepMs,
  );
  const band = splitAcrossIntervals(
    r.readingTime,
    r.endTime!,
    Number(r.uncertaintyKwh ?? 0),
    stepMs,
  );
  return energy.map((p, i) => ({
    start: p.intervalStart.getTime(),
    energy: p.energyKwh.toFixed(6),
    band: band[i].energyKwh.toFixed(6),
  }));
}

/** Each reading's energy and MPE band, split over its intervals alike (by time). */
export function intervalPieces(rows: PreparedReading[]): IntervalPieces {
  const out: IntervalPieces = {
    meterIds: [],
    starts: [],
    energies: [],
    readingTimes: [],
    bands: [],
    shared: false,
    from: Infinity,
    to: -Infinity,
  };
  // An interval at or before the latest seen for its meter may be shared
  // (exactly so for readings in key order); saying so only costs a grouping.
  const latest = new Map<string, number>();
  for (const r of rows) {
    const readingTime = r.readingTime.toISOString();
    for (const p of piecesOf(r)) {
      const before = latest.get(r.meter.id) ?? -Infinity;
      out.shared ||= p.start <= before;
      latest.set(r.meter.id, Math.max(before, p.start));
      out.meterIds.push(r.meter.id);
      out.starts.push(new Date(p.start).toISOString());
      out.energies.push(p.energy);
      out.readingTimes.push(readingTime);
      out.bands.push(p.band);
      out.from = Math.min(out.from, p.start);
      out.to = Math.max(out.to, p.start);
    }
  }
  return out;
}
