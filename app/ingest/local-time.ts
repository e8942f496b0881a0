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
  };
}

/** 0–167: (weekday − 1) × 24 + hour, the slot of a weekly profile. */
export function weekHourSlot(d: Date, timeZone: string): number {
  const p = localParts(d, timeZone);
  return (p.weekday - 1) * 24 + p.hour;
}
