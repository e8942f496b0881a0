// The series of one meter's intervals (15, 30 or 60 minutes, its
// resolution), as the ingest modules pass it around. An interval's
// intervalStart is a UTC instant on a multiple of its length.

/** How an interval's energy came to be: read, estimated, edited, or not at all. */
export const intervalQualities = [
  "measured",
  "estimated",
  "edited",
  "missing",
] as const;
export type Quality = (typeof intervalQualities)[number];

export interface IntervalPoint {
  intervalStart: Date;
  energyKwh: number;
  quality: Quality;
  /**
   * An estimated hour that shares out a register's real advance across a gap
   * between two reads: the total was measured, only its split is ours.
   */
  registerSpread?: boolean;
}

/**
 * A value someone stands behind: what the meter registered, or what a person
 * edited it to. Estimates and missing hours are not known values, so they are
 * never used to estimate other hours and never count as data in a gap check.
 */
export function isKnown(point: IntervalPoint): boolean {
  return point.quality === "measured" || point.quality === "edited";
}

/** The known points, sorted by hour (the input may come in any order). */
export function knownPoints(series: readonly IntervalPoint[]): IntervalPoint[] {
  return series
    .filter(isKnown)
    .sort((a, b) => a.intervalStart.getTime() - b.intervalStart.getTime());
}
