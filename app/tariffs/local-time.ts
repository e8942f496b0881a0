/**
 * Where a UTC instant falls in a site's local week, for pricing by time band.
 * The zone's offset is asked of Intl once per zone and UTC hour (offsets
 * change only on the hour or half hour, never inside a quarter), so a year
 * of intervals costs some thousands of look-ups, not one per interval.
 */
import { QUARTERS_PER_DAY } from "./band-week";

const HOUR_MS = 3_600_000;
const DAY_MS = 86_400_000;
const QUARTER_MS = 900_000;

const formatters = new Map<string, Intl.DateTimeFormat>();
/** Per zone: the offset of each UTC hour, NaN for an hour with a change inside it. */
const offsets = new Map<string, Map<number, number>>();

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

function askIntl(timeZone: string, utcMs: number): number {
  const parts = Object.fromEntries(
    formatter(timeZone)
      .formatToParts(new Date(utcMs))
      .map((p) => [p.type, p.value]),
  );
  const asUtc = Date.UTC(
    Number(parts.year),
    Number(parts.month) - 1,
    Number(parts.day),
    Number(parts.hour),
    Number(parts.minute),
  );
  return asUtc - Math.floor(utcMs / 60_000) * 60_000;
}

/**
 * The zone's offset from UTC, in ms, at a UTC instant. Kept per UTC hour
 * when the offset is the same at its start and its last quarter (nearly
 * always); an hour with a change in it (a :30 zone's DST step) is asked per
 * quarter.
 */
export function offsetMs(timeZone: string, utcMs: number): number {
  const hour = Math.floor(utcMs / HOUR_MS);
  let zone = offsets.get(timeZone);
  if (!zone || zone.size > 200_000) {
    zone = new Map();
    offsets.set(timeZone, zone);
  }
  const known = zone.get(hour);
  if (known !== undefined && !Number.isNaN(known)) return known;
  if (known === undefined) {
    const atStart = askIntl(timeZone, hour * HOUR_MS);
    const atLast = askIntl(timeZone, hour * HOUR_MS + 3 * QUARTER_MS);
    zone.set(hour, atStart === atLast ? atStart : Number.NaN);
    if (atStart === atLast) return atStart;
  }
  return askIntl(timeZone, Math.floor(utcMs / QUARTER_MS) * QUARTER_MS);
}

export interface LocalQuarter {
  /** 0 … 671 from Monday 00:00 local. */
  weekQuarter: number;
  /** The local day, as days since 1970-01-01 (dayNumber). */
  day: number;
}

/** YYYY-MM-DD as days since 1970-01-01. */
export function dayNumber(day: string): number {
  return Math.floor(Date.parse(`${day}T00:00:00Z`) / DAY_MS);
}

/** The local quarter hour of the week, and the local day, of a UTC instant. */
export function localQuarter(timeZone: string, utcMs: number): LocalQuarter {
  const localMs = utcMs + offsetMs(timeZone, utcMs);
  const days = Math.floor(localMs / DAY_MS);
  // 1970-01-01 was a Thursday: index 3 counting from Monday.
  const weekday = (((days + 3) % 7) + 7) % 7;
  const inDay = Math.floor((localMs - days * DAY_MS) / QUARTER_MS);
  return {
    weekQuarter: weekday * QUARTERS_PER_DAY + inDay,
    day: days,
  };
}

export { DAY_MS, HOUR_MS, QUARTER_MS };
