// Plausibility checks over the hourly series of one meter. They flag; they
// never change a value: what to do with a flagged hour is the energy
// manager's decision (edit it, or accept it).

import { HOUR_MS, floorToHour } from "./hours";
import { isKnown } from "./series";
import type { HourlyPoint } from "./series";
import type { Orientation } from "~/sites/meter-kinds";

export const DEFAULT_SPIKE_FACTOR = 10;

function median(sorted: readonly number[]): number {
  const mid = Math.floor(sorted.length / 2);
  if (sorted.length % 2 === 1) return sorted[mid];
  return (sorted[mid - 1] + sorted[mid]) / 2;
}

/**
 * The typical size of a measured hour: the median of |value| over measured
 * hours, zeros left out. Zeros are left out because many meters are idle for
 * most hours (solar export at night, school heating in summer): with them the
 * median would be 0 and every working hour would look like a spike. The
 * median rather than the mean, so that the spikes being looked for do not
 * raise the yardstick. Null when no measured hour is non-zero.
 */
export function typicalHourlyValue(
  series: readonly HourlyPoint[],
): number | null {
  const values = series
    .filter((p) => p.quality === "measured" && p.energyKwh !== 0)
    .map((p) => Math.abs(p.energyKwh))
    .sort((a, b) => a - b);
  return values.length === 0 ? null : median(values);
}

/**
 * Measured hours whose |value| exceeds factor × the typical value. Edited
 * hours are a person's decision and estimated hours are ours, so they are
 * not checked, except hours that share out a register's advance across a gap:
 * that energy comes from the meter, and a register read far too high (a typo,
 * a wrong multiplier) shows up there first.
 */
export function detectSpikes(
  series: readonly HourlyPoint[],
  factor = DEFAULT_SPIKE_FACTOR,
): HourlyPoint[] {
  if (!(factor > 0)) throw new RangeError("factor must be greater than 0");
  const typical = typicalHourlyValue(series);
  if (typical === null) return [];
  return series.filter(
    (p) =>
      (p.quality === "measured" || p.registerSpread === true) &&
      isSpike(p.energyKwh, typical, factor),
  );
}

/**
 * The one spike rule, for ingest's flags and for a person's correction
 * alike: |value| above factor × the meter's typical hour.
 */
export function isSpike(
  energyKwh: number,
  typical: number,
  factor: number,
): boolean {
  return Math.abs(energyKwh) > factor * typical;
}

/** What a meter's hours mean: its carrier and its boundary orientation. */
export interface MeterBoundary {
  carrier: string;
  orientation: Orientation;
}

/**
 * The sign every hour of this meter has in the ledger (docs/physics.md,
 * "Sign convention"): chilled water comes out of the physics negative, and
 * an export meter's values are flipped.
 */
export function expectedSign(meter: MeterBoundary): 1 | -1 {
  const natural = meter.carrier === "cooling" ? -1 : 1;
  return meter.orientation === "export" ? (-natural as 1 | -1) : natural;
}

/**
 * Measured hours with the wrong sign. `expectedSign` is the sign every value
 * of this meter should have in the series given: +1 for a meter of energy
 * consumed (heat, electricity in), −1 for one whose values are negative by
 * nature or by orientation (chilled water, an export meter after the sign
 * flip). Zero is never wrong.
 */
export function detectNegative(
  series: readonly HourlyPoint[],
  expectedSign: 1 | -1 = 1,
): HourlyPoint[] {
  return series.filter(
    (p) => p.quality === "measured" && p.energyKwh * expectedSign < 0,
  );
}

export interface Gap {
  start: Date;
  hours: number;
  /**
   * "leading": no known hour before it in the window; "trailing": none after
   * it (the meter may just be silent); null: known hours on both sides.
   */
  edge: "leading" | "trailing" | null;
}

/**
 * Runs of UTC hours in [from, to) without a known value (measured or
 * edited). Hours absent from the series count as missing, and so do
 * estimated hours: an estimate fills a gap, it does not close it.
 */
export function findGaps(
  series: readonly HourlyPoint[],
  from: Date,
  to: Date,
): Gap[] {
  const known = new Set(
    series.filter(isKnown).map((p) => floorToHour(p.intervalStart).getTime()),
  );
  const gaps: Gap[] = [];
  let runStart: number | null = null;
  let seenKnown = false;
  const end = to.getTime();
  for (let t = floorToHour(from).getTime(); t < end; t += HOUR_MS) {
    if (!known.has(t)) {
      runStart ??= t;
      continue;
    }
    if (runStart !== null) {
      gaps.push(gapOf(runStart, t, seenKnown ? null : "leading"));
      runStart = null;
    }
    seenKnown = true;
  }
  if (runStart !== null) {
    gaps.push(gapOf(runStart, end, seenKnown ? "trailing" : "leading"));
  }
  return gaps;
}

function gapOf(start: number, end: number, edge: Gap["edge"]): Gap {
  return {
    start: new Date(start),
    hours: Math.ceil((end - start) / HOUR_MS),
    edge,
  };
}
