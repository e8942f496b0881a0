/**
 * When a meter's energy may be recorded. A gateway's reading and a person's
 * correction of one interval pass the same rules, so an interval that ingest
 * would refuse cannot be written by an edit either (docs/ingest.md, "Rules").
 */
import { floorToStep, stepMsOf } from "./hours";

export const EARLIEST_READING = new Date("1990-01-01T00:00:00Z");
/** Gateway clocks drift; a reading this far ahead of ours is still taken. */
export const CLOCK_SKEW_MS = 10 * 60_000;
/** One reading may cover at most this long an interval. */
export const MAX_INTERVAL_MS = 31 * 86_400_000;

/** Not before 1990 (nor year 0 or a typo's 0201), not in the future. */
export function instantError(
  field: string,
  at: Date,
  now: Date,
): string | null {
  if (Number.isNaN(at.getTime())) return `${field}: is not a valid time`;
  if (at < EARLIEST_READING)
    return `${field}: before 1990-01-01 is not accepted`;
  if (at.getTime() > now.getTime() + CLOCK_SKEW_MS)
    return `${field}: is in the future`;
  return null;
}

export function intervalError(
  start: Date,
  end: Date,
  now: Date,
): string | null {
  const timeError =
    instantError("start", start, now) ?? instantError("end", end, now);
  if (timeError) return timeError;
  if (end <= start) return "end: must be after start";
  if (end.getTime() - start.getTime() > MAX_INTERVAL_MS)
    return "end: one reading may cover at most 31 days";
  return null;
}

/** A meter's life: from its installation to its removal, if it was removed. */
export interface InstalledPeriod {
  code: string;
  installedAt: Date;
  removedAt: Date | null;
}

/** Null when the meter was installed at `at`, else the reason. */
export function installedError(
  meter: InstalledPeriod,
  at: Date,
): string | null {
  const installed =
    at >= meter.installedAt && (!meter.removedAt || at <= meter.removedAt);
  return installed
    ? null
    : `meter ${meter.code} was not installed at ${at.toISOString()}`;
}

/**
 * The rules for correcting the interval starting at `intervalStart`: one of
 * the meter's intervals (on a multiple of its interval_minutes in UTC), at a
 * time a reading would be taken, in the meter's life. Checked against the
 * interval's start, as ingest checks a reading's start.
 */
export function correctionIntervalError(
  meter: InstalledPeriod & { intervalMinutes: number },
  intervalStart: Date,
  now: Date,
): string | null {
  const timeError = instantError("interval", intervalStart, now);
  if (timeError) return timeError;
  const start = floorToStep(intervalStart, stepMsOf(meter));
  if (start.getTime() !== intervalStart.getTime())
    return meter.intervalMinutes === 60
      ? "interval: must start on the hour"
      : `interval: must start on a multiple of ${meter.intervalMinutes} minutes`;
  return installedError(meter, intervalStart);
}
