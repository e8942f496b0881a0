/**
 * Data quality over a report's period, per meter: the hours it should have
 * (installed, within the period, up to the time of generation), how many
 * were measured, estimated, edited or are missing, its longest spell
 * without a measured hour, and the conflicting readings kept for review.
 * Pure: the counts come from data-quality.server.ts.
 */
import { NO_DATA_AFTER_HOURS } from "~/alerts/no-data";
import type { Orientation } from "~/sites/meter-kinds";
import type { Carrier, DataQuality, MeterQuality } from "./types";

const HOUR = 3_600_000;

export interface MeterHourCounts {
  siteName: string;
  code: string;
  name: string;
  carrier: Carrier;
  orientation: Orientation;
  subMeter: boolean;
  retired: boolean;
  /** The meter's window in the period: [from, to). */
  from: Date;
  to: Date;
  measured: number;
  estimated: number;
  edited: number;
  firstMeasured: Date | null;
  lastMeasured: Date | null;
  /** Longest gap between two measured hours, in hours (0 when none). */
  longestInnerGapHours: number;
  conflicts: number;
  openConflicts: number;
}

/** Whole hours from the first full hour at or after `from` up to `to`. */
export function hoursBetween(from: Date, to: Date): number {
  const start = Math.ceil(from.getTime() / HOUR);
  const end = Math.floor(to.getTime() / HOUR);
  return Math.max(0, end - start);
}

export function meterQuality(c: MeterHourCounts): MeterQuality {
  const expectedHours = hoursBetween(c.from, c.to);
  const known = c.measured + c.estimated + c.edited;
  const longestSilentHours =
    c.firstMeasured && c.lastMeasured
      ? Math.max(
          c.longestInnerGapHours,
          hoursBetween(c.from, c.firstMeasured),
          hoursBetween(new Date(c.lastMeasured.getTime() + HOUR), c.to),
        )
      : expectedHours;
  return {
    siteName: c.siteName,
    code: c.code,
    name: c.name,
    carrier: c.carrier,
    orientation: c.orientation,
    subMeter: c.subMeter,
    retired: c.retired,
    expectedHours,
    measuredHours: c.measured,
    estimatedHours: c.estimated,
    editedHours: c.edited,
    missingHours: Math.max(0, expectedHours - known),
    longestSilentHours,
    conflicts: c.conflicts,
    openConflicts: c.openConflicts,
  };
}

export function dataQuality(counts: readonly MeterHourCounts[]): DataQuality {
  const meters = counts.map(meterQuality);
  const sum = (pick: (m: MeterQuality) => number) =>
    meters.reduce((s, m) => s + pick(m), 0);
  return {
    meters,
    expectedHours: sum((m) => m.expectedHours),
    measuredHours: sum((m) => m.measuredHours),
    estimatedHours: sum((m) => m.estimatedHours),
    editedHours: sum((m) => m.editedHours),
    missingHours: sum((m) => m.missingHours),
    silentAfterHours: NO_DATA_AFTER_HOURS,
    silentMeters: meters.filter(
      (m) => m.longestSilentHours >= NO_DATA_AFTER_HOURS,
    ).length,
    conflicts: sum((m) => m.conflicts),
    openConflicts: sum((m) => m.openConflicts),
  };
}
