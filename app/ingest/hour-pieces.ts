// A batch's interval readings as hourly pieces, in the column arrays the
// intervals statement takes (store-readings.server.ts).

import { HOUR_MS, splitAcrossHours } from "./hours";
import type { PreparedReading } from "./prepare-readings.server";

export interface HourPiece {
  /** Start of the UTC hour, ms. */
  hour: number;
  /** Signed kWh and ± kWh band, as numeric text with six decimals. */
  energy: string;
  band: string;
}

export interface HourPieces {
  meterIds: string[];
  hours: string[];
  energies: string[];
  readingTimes: string[];
  bands: string[];
  /** Whether two pieces fall in the same hour of a meter (then they add). */
  shared: boolean;
  from: number;
  to: number;
}

/**
 * A reading inside one hour is that hour's piece as it is: the split would
 * give back the same number, so its text goes through unchanged.
 */
export function piecesOf(r: PreparedReading): HourPiece[] {
  const start = r.readingTime.getTime();
  const hour = start - (start % HOUR_MS);
  if (r.endTime!.getTime() <= hour + HOUR_MS) {
    return [
      {
        hour,
        energy: r.energyKwh!,
        band: r.uncertaintyKwh ?? "0.000000",
      },
    ];
  }
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
    hour: p.intervalStart.getTime(),
    energy: p.energyKwh.toFixed(6),
    band: band[i].energyKwh.toFixed(6),
  }));
}

/** Each reading's energy and MPE band, split over its hours alike (by time). */
export function hourPieces(rows: PreparedReading[]): HourPieces {
  const out: HourPieces = {
    meterIds: [],
    hours: [],
    energies: [],
    readingTimes: [],
    bands: [],
    shared: false,
    from: Infinity,
    to: -Infinity,
  };
  // An hour at or before the latest hour seen for its meter may be shared
  // (exactly so for readings in key order); saying so only costs a grouping.
  const latest = new Map<string, number>();
  for (const r of rows) {
    const readingTime = r.readingTime.toISOString();
    for (const p of piecesOf(r)) {
      const before = latest.get(r.meter.id) ?? -Infinity;
      out.shared ||= p.hour <= before;
      latest.set(r.meter.id, Math.max(before, p.hour));
      out.meterIds.push(r.meter.id);
      out.hours.push(new Date(p.hour).toISOString());
      out.energies.push(p.energy);
      out.readingTimes.push(readingTime);
      out.bands.push(p.band);
      out.from = Math.min(out.from, p.hour);
      out.to = Math.max(out.to, p.hour);
    }
  }
  return out;
}
