// Arithmetic on a meter's UTC intervals (15, 30 or 60 minutes: `stepMs`,
// an hour unless said), and the split of a reading's energy into the
// intervals it covers. UTC has no daylight-saving folds, so an interval is
// always exactly its length and starts on a multiple of it; local time
// matters only for profiles and reports (see local-time.ts).

export const HOUR_MS = 3_600_000;

/** A meter's interval length in ms, from its interval_minutes. */
export function stepMsOf(meter: { intervalMinutes: number }): number {
  return meter.intervalMinutes * 60_000;
}

export interface IntervalPiece {
  intervalStart: Date;
  energyKwh: number;
}

/** The start of the interval of length `stepMs` that holds `d`. */
export function floorToStep(d: Date, stepMs: number): Date {
  return new Date(Math.floor(d.getTime() / stepMs) * stepMs);
}

export function floorToHour(d: Date): Date {
  return floorToStep(d, HOUR_MS);
}

/** (b − a) in hours; fractional and signed, like b − a itself. */
export function hoursBetween(a: Date, b: Date): number {
  return (b.getTime() - a.getTime()) / HOUR_MS;
}

export function addHours(d: Date, hours: number): Date {
  return new Date(d.getTime() + hours * HOUR_MS);
}

/** The starts of the intervals that overlap [from, to), in order. */
export function intervalStartsBetween(
  from: Date,
  to: Date,
  stepMs = HOUR_MS,
): Date[] {
  const out: Date[] = [];
  for (
    let t = floorToStep(from, stepMs).getTime();
    t < to.getTime();
    t += stepMs
  ) {
    out.push(new Date(t));
  }
  return out;
}

function requireInterval(start: Date, end: Date): void {
  if (!Number.isFinite(start.getTime()) || !Number.isFinite(end.getTime())) {
    throw new RangeError("start and end must be valid dates");
  }
  if (end.getTime() <= start.getTime()) {
    throw new RangeError(
      `end ${end.toISOString()} must be after start ${start.toISOString()}: ` +
        `a reading without duration cannot be placed in an interval`,
    );
  }
}

/**
 * Splits a reading's energy over the intervals of `stepMs` it covers, pro
 * rata by time (the meter cannot tell when inside the reading the energy
 * flowed, so an even rate is the least-assuming choice). A reading inside
 * one interval goes wholly to it. The last piece takes the rounding
 * remainder, so that adding the pieces in order gives back the input exactly.
 */
export function splitAcrossIntervals(
  start: Date,
  end: Date,
  energyKwh: number,
  stepMs = HOUR_MS,
): IntervalPiece[] {
  requireInterval(start, end);
  if (!Number.isFinite(energyKwh)) {
    throw new RangeError(`energy must be a finite number, got ${energyKwh}`);
  }
  const s = start.getTime();
  const e = end.getTime();
  const hours = intervalStartsBetween(start, end, stepMs);
  const grain = ulp(energyKwh);
  const pieces: IntervalPiece[] = [];
  let sum = 0;
  for (let i = 0; i < hours.length - 1; i++) {
    const h = hours[i].getTime();
    const overlap = Math.min(e, h + stepMs) - Math.max(s, h);
    const piece = snap((energyKwh * overlap) / (e - s), grain);
    pieces.push({ intervalStart: hours[i], energyKwh: piece });
    sum += piece;
  }
  pieces.push({
    intervalStart: hours[hours.length - 1],
    energyKwh: energyKwh - sum,
  });
  return pieces;
}

// Why the pieces are snapped: with arbitrary pieces, total − sum can round
// by half a unit in the last place and sum + remainder then misses the total
// (about 1 split in 100 when the first pieces are small). With every piece a
// whole multiple of ulp(total), a power of two, all the partial sums, the
// remainder and the final sum are exact. The cost is below 1e-16 of the
// total per piece.
function snap(x: number, grain: number): number {
  return Math.round(x / grain) * grain;
}

/** The spacing of doubles at |x| (for 0, the smallest subnormal). */
export function ulp(x: number): number {
  const a = Math.abs(x);
  return nextFloat(a, 1) - a;
}

const scratch = new DataView(new ArrayBuffer(8));

/** The adjacent double towards +∞ (direction 1) or −∞ (direction −1). */
export function nextFloat(x: number, direction: 1 | -1): number {
  if (x === 0) return direction * Number.MIN_VALUE;
  scratch.setFloat64(0, x);
  const bits = scratch.getBigInt64(0);
  const awayFromZero = x > 0 === direction > 0;
  scratch.setBigInt64(0, awayFromZero ? bits + 1n : bits - 1n);
  return scratch.getFloat64(0);
}

/** Adds pieces that fall in the same interval; the result is sorted by start. */
export function sumByInterval(
  pieces: readonly IntervalPiece[],
): IntervalPiece[] {
  const byHour = new Map<number, number>();
  for (const p of pieces) {
    const t = p.intervalStart.getTime();
    byHour.set(t, (byHour.get(t) ?? 0) + p.energyKwh);
  }
  return [...byHour.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([t, energyKwh]) => ({ intervalStart: new Date(t), energyKwh }));
}
