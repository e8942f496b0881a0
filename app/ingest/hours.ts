// Hour arithmetic on UTC hours, and the split of a reading's energy into the
// hours it covers. UTC hours have no daylight-saving folds, so an hourly
// interval is always 3 600 000 ms long; local time matters only for
// profiles and reports (see local-time.ts).

export const HOUR_MS = 3_600_000;

export interface HourPiece {
  intervalStart: Date;
  energyKwh: number;
}

export function floorToHour(d: Date): Date {
  return new Date(Math.floor(d.getTime() / HOUR_MS) * HOUR_MS);
}

/** (b − a) in hours; fractional and signed, like b − a itself. */
export function hoursBetween(a: Date, b: Date): number {
  return (b.getTime() - a.getTime()) / HOUR_MS;
}

export function addHours(d: Date, hours: number): Date {
  return new Date(d.getTime() + hours * HOUR_MS);
}

/** The starts of the UTC hours that overlap [from, to), in order. */
export function intervalStartsBetween(from: Date, to: Date): Date[] {
  const out: Date[] = [];
  for (let t = floorToHour(from).getTime(); t < to.getTime(); t += HOUR_MS) {
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
        `a reading without duration cannot be placed in an hour`,
    );
  }
}

/**
 * Splits a reading's energy over the UTC hours it covers, pro rata by time
 * (the meter cannot tell when inside the interval the energy flowed, so an
 * even rate is the least-assuming choice). A reading inside one hour goes
 * wholly to that hour. The last piece takes the rounding remainder, so that
 * adding the pieces in order gives back the input exactly.
 */
export function splitAcrossHours(
  start: Date,
  end: Date,
  energyKwh: number,
): HourPiece[] {
  requireInterval(start, end);
  if (!Number.isFinite(energyKwh)) {
    throw new RangeError(`energy must be a finite number, got ${energyKwh}`);
  }
  const s = start.getTime();
  const e = end.getTime();
  const hours = intervalStartsBetween(start, end);
  const grain = ulp(energyKwh);
  const pieces: HourPiece[] = [];
  let sum = 0;
  for (let i = 0; i < hours.length - 1; i++) {
    const h = hours[i].getTime();
    const overlap = Math.min(e, h + HOUR_MS) - Math.max(s, h);
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

/** Adds pieces that fall in the same hour; the result is sorted by hour. */
export function sumByHour(pieces: readonly HourPiece[]): HourPiece[] {
  const byHour = new Map<number, number>();
  for (const p of pieces) {
    const t = p.intervalStart.getTime();
    byHour.set(t, (byHour.get(t) ?? 0) + p.energyKwh);
  }
  return [...byHour.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([t, energyKwh]) => ({ intervalStart: new Date(t), energyKwh }));
}
