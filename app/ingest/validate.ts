// Plausibility checks over the series of one meter's intervals, at its own
// resolution: a spike is judged against the meter's typical interval, not an
// hour. They flag; they never change a value: what to do with a flagged
// interval is the energy manager's decision (edit it, or accept it).

import { HOUR_MS, floorToStep } from "./hours";
import { isKnown } from "./series";
import type { IntervalPoint } from "./series";
import type { Orientation } from "~/sites/meter-kinds";

export const DEFAULT_SPIKE_FACTOR = 10;

function median(sorted: readonly number[]): number {
  const mid = Math.floor(sorted.length / 2);
  if (sorted.length % 2 === 1) return sorted[mid];
  return (sorted[mid - 1] + sorted[mid]) / 2;
}

/**
 * The typical size of a measured interval: the median of |value| over
 * measured intervals, zeros left out. Zeros are left out because many meters are idle for
 * most hours (solar export at night, school heating in summer): with them the
 * median would be 0 and every working hour would look like a spike. The
 * median rather than the mean, so that the spikes being looked for do not
 * raise the yardstick. Null when no measured hour is non-zero.
 */
export function typicalIntervalValue(
  series: readonly IntervalPoint[],
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
  series: readonly IntervalPoint[],
  factor = DEFAULT_SPIKE_FACTOR,
): IntervalPoint[] {
  if (!(factor > 0)) throw new RangeError("factor must be greater than 0");
  const typical = typicalIntervalValue(series);
  if (typical === null) return [];
  return series.filter(
    (p) =>
      (p.quality === "measured" || p.registerSpread === true) &&
      isSpike(p.energyKwh, typical, factor),
  );
}

/**
 * The one spike rule, for ingest's flags and for a person's correction
 * alike: |value| above factor × the meter's typical interval.
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
  series: readonly IntervalPoint[],
  expectedSign: 1 | -1 = 1,
): IntervalPoint[] {
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
 * Runs of intervals of `stepMs` (the meter's resolution) in [from, to)
 * without a known value (measured or edited). Intervals absent from the
 * series count as missing, and so do estimated ones: an estimate fills a
 * gap, it does not close it. A gap's length is said in hours all the same.
 */
export function findGaps(
  series: readonly IntervalPoint[],
  from: Date,
  to: Date,
  stepMs = HOUR_MS,
): Gap[] {
  const known = new Set(
    series
      .filter(isKnown)
      .map((p) => floorToStep(p.intervalStart, stepMs).getTime()),
  );
  const gaps: Gap[] = [];
  let runStart: number | null = null;
  let seenKnown = false;
  const end = to.getTime();
  for (let t = floorToStep(from, stepMs).getTime(); t < end; t += stepMs) {
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
