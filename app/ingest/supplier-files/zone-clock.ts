/**
 * Wall-clock times in a site's time zone turned into UTC instants, with the
 * platform's time-zone database (Intl) so daylight saving follows the official
 * rules. package.json has date-fns but not its time-zone add-on, and Intl is
 * all this needs.
 *
 * A wall-clock time is held as the milliseconds Date.UTC gives for its fields
 * ("wall milliseconds"): arithmetic on it is plain and the zone is applied once.
 */

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;

export interface WallClock {
  year: number;
  /** 1–12 */
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

export function wallMs(w: WallClock): number {
  return Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second);
}

export type WallResolution =
  | { kind: "unique"; instant: number }
  /** The hour the clocks go back: the time happens twice. */
  | { kind: "repeated"; earlier: number; later: number }
  /** The hour the clocks go forward: the time never happens. */
  | { kind: "skipped"; gapMinutes: number };

/** One calendar day of the zone: its first instant and the next day's. */
export interface LocalDay {
  start: number;
  end: number;
  /** The clocks do not change during the day (it lasts 24 hours). */
  steady: boolean;
  /** wall − UTC at the day's start, in minutes (60 in BST). */
  offsetMinutes: number;
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (f === undefined) {
    // hourCycle h23, not hour12: false, which some engines render as "24" at midnight.
    f = new Intl.DateTimeFormat("en-US", {
      timeZone,
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      second: "numeric",
      hourCycle: "h23",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

export function isValidTimeZone(timeZone: string): boolean {
  try {
    formatterFor(timeZone);
    return true;
  } catch {
    return false;
  }
}

/** wall − UTC at an instant, in minutes: 0 in GMT, 60 in BST. */
export function offsetMinutesAt(instant: number, timeZone: string): number {
  const whole = Math.floor(instant / 1000) * 1000;
  const f: Record<string, number> = {};
  for (const part of formatterFor(timeZone).formatToParts(whole)) {
    if (part.type !== "literal") f[part.type] = Number(part.value);
  }
  const asWall = Date.UTC(
    f.year,
    f.month - 1,
    f.day,
    f.hour,
    f.minute,
    f.second,
  );
  return (asWall - whole) / MINUTE_MS;
}

/** The instant(s) a wall-clock time names in a zone; none in a spring-forward gap, two in an autumn repeat. */
export function resolveWall(wall: number, timeZone: string): WallResolution {
  // The offsets half a day either side: the only two a time can have, as
  // clocks change at most once a day.
  const before = offsetMinutesAt(wall - DAY_MS / 2, timeZone);
  const after = offsetMinutesAt(wall + DAY_MS / 2, timeZone);
  const instants: number[] = [];
  for (const offset of before === after ? [before] : [before, after]) {
    const instant = wall - offset * MINUTE_MS;
    if (offsetMinutesAt(instant, timeZone) === offset) instants.push(instant);
  }
  instants.sort((a, b) => a - b);
  if (instants.length === 0) {
    return { kind: "skipped", gapMinutes: after - before };
  }
  if (instants.length === 1) return { kind: "unique", instant: instants[0] };
  return { kind: "repeated", earlier: instants[0], later: instants[1] };
}

/** The first instant at or after `from` whose offset differs from `from`'s, to the minute. */
function nextChange(from: number, to: number, timeZone: string): number {
  const offset = offsetMinutesAt(from, timeZone);
  let lo = from;
  let hi = to;
  while (hi - lo > MINUTE_MS) {
    const mid = lo + Math.floor((hi - lo) / 2 / MINUTE_MS) * MINUTE_MS;
    if (offsetMinutesAt(mid, timeZone) === offset) lo = mid;
    else hi = mid;
  }
  return hi;
}

/** The first instant of a local day: its midnight, or the end of a gap that swallows midnight. */
function firstInstantOf(midnight: number, timeZone: string): number {
  const r = resolveWall(midnight, timeZone);
  if (r.kind === "unique") return r.instant;
  if (r.kind === "repeated") return r.earlier;
  return nextChange(midnight - DAY_MS, midnight + DAY_MS, timeZone);
}

/**
 * A zone's clock with its days remembered: Intl is slow (microseconds a call),
 * and a year of half-hours touches only 365 days, so a time on a day without a
 * clock change costs one map look-up.
 */
export class ZoneClock {
  private readonly days = new Map<number, LocalDay>();

  constructor(readonly timeZone: string) {}

  /** A local day by its date fields. */
  day(year: number, month: number, day: number): LocalDay {
    return this.dayOfWall(Date.UTC(year, month - 1, day));
  }

  /** The local day holding a wall-clock time. */
  dayOfWall(wall: number): LocalDay {
    // Days since 1970: a small integer, quick to look up.
    const key = Math.floor(wall / DAY_MS);
    let found = this.days.get(key);
    if (found === undefined) {
      const midnight = key * DAY_MS;
      const start = firstInstantOf(midnight, this.timeZone);
      const end = firstInstantOf(midnight + DAY_MS, this.timeZone);
      found = {
        start,
        end,
        steady: end - start === DAY_MS,
        offsetMinutes: (midnight - start) / MINUTE_MS,
      };
      this.days.set(key, found);
    }
    return found;
  }

  resolve(wall: number): WallResolution {
    const day = this.dayOfWall(wall);
    if (day.steady) {
      return { kind: "unique", instant: wall - day.offsetMinutes * MINUTE_MS };
    }
    return resolveWall(wall, this.timeZone);
  }

  /** Minutes from the local midnight of `dayWallMidnight` to an instant's wall-clock time. */
  wallMinutesOfDay(instant: number, dayWallMidnight: number): number {
    const wall = instant + offsetMinutesAt(instant, this.timeZone) * MINUTE_MS;
    return (wall - dayWallMidnight) / MINUTE_MS;
  }
}
