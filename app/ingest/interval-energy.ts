/**
 * `interval_energy` readings (design.md, "Data in"): the kWh of one interval
 * as a supplier or a data logger gives it, a magnitude whose sign comes from
 * the meter's orientation. The interval must be exactly one of the meter's
 * own intervals, so a reading never has to be split or merged.
 */
import { isRegisterQuantity } from "./reading-schema";

export const INTERVAL_ENERGY = "interval_energy";

/** A meter's interval length: its resolution column (15, 30 or 60 minutes). */
export function resolutionMinutes(meter: { intervalMinutes: number }): number {
  return meter.intervalMinutes;
}

function utcClock(at: Date): string {
  return at.toISOString().slice(11, 16);
}

/**
 * Null when [start, end) is one of the meter's intervals: aligned to its
 * resolution in UTC, and exactly that long. Else the reason.
 */
export function resolutionError(
  minutes: number,
  start: Date,
  end: Date,
): string | null {
  const stepMs = minutes * 60_000;
  const coveredMinutes = (end.getTime() - start.getTime()) / 60_000;
  if (coveredMinutes !== minutes)
    return `end: this meter records ${minutes}-minute intervals; the reading covers ${formatMinutes(coveredMinutes)}`;
  if (start.getTime() % stepMs !== 0)
    return `start: this meter records ${minutes}-minute intervals, which start on a multiple of ${minutes} minutes in UTC; the reading starts at ${utcClock(start)} UTC`;
  return null;
}

function formatMinutes(minutes: number): string {
  const rounded = Math.round(minutes * 1000) / 1000;
  return `${rounded} minute${rounded === 1 ? "" : "s"}`;
}

/**
 * Register meters take no interval energy: their hours are recomputed from
 * consecutive register reads whenever a read arrives, which would overwrite
 * the interval's hour without a word.
 */
export function meterKindError(meter: {
  code: string;
  quantity: string;
}): string | null {
  return isRegisterQuantity(meter.quantity)
    ? `quantity: meter ${meter.code} is a register (${meter.quantity}); send its register reads, not interval_energy`
    : null;
}
