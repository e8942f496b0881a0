// Local calendar fields of an instant in a site's time zone, from the
// platform's time-zone database (Intl), so daylight saving follows the
// official rules instead of a hand-written approximation.

export interface LocalParts {
  year: number;
  /** 1–12 */
  month: number;
  /** 1–31 */
  day: number;
  /** ISO 8601 weekday: 1 = Monday … 7 = Sunday. */
  weekday: number;
  /** 0–23 */
  hour: number;
  /** 0–59 (zones such as Asia/Kolkata are offset by half an hour). */
  minute: number;
}

const WEEKDAY: Record<string, number> = {
  Mon: 1,
  Tue: 2,
  Wed: 3,
  Thu: 4,
  Fri: 5,
  Sat: 6,
  Sun: 7,
};

// Building a DateTimeFormat costs far more than using one: keep one per zone.
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (f === undefined) {
    // hourCycle h23, not hour12: false, which some engines render as "24"
    // at midnight.
    f = new Intl.DateTimeFormat("en-GB", {
      timeZone,
      year: "numeric",
      month: "numeric",
      day: "numeric",
      weekday: "short",
      hour: "numeric",
      minute: "numeric",
      hourCycle: "h23",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

export function localParts(d: Date, timeZone: string): LocalParts {
  const fields: Record<string, string> = {};
  for (const part of formatterFor(timeZone).formatToParts(d)) {
    fields[part.type] = part.value;
  }
  return {
    year: Number(fields.year),
    month: Number(fields.month),
    day: Number(fields.day),
    weekday: WEEKDAY[fields.weekday],
    hour: Number(fields.hour),
    minute: Number(fields.minute),
  };
}

/**
 * The slot of a weekly profile for intervals of `minutes`: (weekday − 1) ×
 * intervals per day + the local interval of the day. For hours, 0–167; for
 * half-hours, 0–335. On a daylight-saving day the local clock repeats or
 * skips an hour, and so do these slots, as the site's own week does.
 */
export function weekSlot(d: Date, timeZone: string, minutes = 60): number {
  const p = localParts(d, timeZone);
  const perDay = (24 * 60) / minutes;
  return (
    (p.weekday - 1) * perDay + Math.floor((p.hour * 60 + p.minute) / minutes)
  );
}

/** 0–167: (weekday − 1) × 24 + hour, the slot of a weekly profile. */
export function weekHourSlot(d: Date, timeZone: string): number {
  const p = localParts(d, timeZone);
  return (p.weekday - 1) * 24 + p.hour;
}
