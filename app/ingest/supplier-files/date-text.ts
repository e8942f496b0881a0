/**
 * Dates and times as supplier files write them, read into wall-clock time
 * (the site's clock) or, when the text carries an offset, a fixed instant.
 *
 * Accepted: ISO 8601 (`2026-03-29T01:30:00Z`, `2026-03-29T01:30+01:00`,
 * `2026-03-29T01:30`), `yyyy-mm-dd hh:mm`, `dd/mm/yyyy hh:mm` (also with `-`
 * or `.` between the date's parts, single-digit day/month/hour, optional
 * seconds), the date alone (`dd/mm/yyyy`, `yyyy-mm-dd`) for one-row-a-day
 * files, spreadsheet date cells and spreadsheet serial numbers. `24:00` is
 * midnight at the end of the day, as files that stamp the end of an interval write it.
 */
import type { Cell } from "./types";
import { isBlank } from "./columns";

/** Year first (ISO), day first (UK), month first (US). */
export type DateOrder = "ymd" | "dmy" | "mdy";

export const DATE_ORDER_NAMES: Record<DateOrder, string> = {
  ymd: "year-month-day (yyyy-mm-dd)",
  dmy: "day/month/year (dd/mm/yyyy)",
  mdy: "month/day/year (mm/dd/yyyy)",
};

export interface ParsedDateTime {
  /** Date.UTC of the written fields: wall-clock time, not yet an instant. */
  wall: number;
  /** The text gave a time of day (spreadsheet date cells always count as having one). */
  hasTime: boolean;
  /** Minutes east of UTC when the text states them (ISO `Z`, `+01:00`); the instant is then `wall − offset`. */
  offsetMinutes?: number;
}

export type DateCellResult = ParsedDateTime | { error: string } | null;

const DAY_MS = 86_400_000;
/** Excel serial day 25569 is 1970-01-01 in the 1900 date system. */
const SERIAL_UNIX_EPOCH = 25_569;
/** The 1904 system's day 0 is 1462 days after the 1900 system's. */
const DATE_1904_SHIFT = 1_462;

const YEAR_FIRST =
  /^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,]\d+)?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?)?$/i;
const YEAR_LAST =
  /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})(?:[T ]+(\d{1,2}):(\d{2})(?::(\d{2}))?)?$/;

const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function daysInMonth(year: number, month: number): number {
  const leap = year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0);
  return month === 2 && leap ? 29 : MONTH_DAYS[month - 1];
}

function offsetOf(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  if (text.toUpperCase() === "Z") return 0;
  const sign = text[0] === "-" ? -1 : 1;
  const digits = text.slice(1).replace(":", "");
  const hours = Number(digits.slice(0, 2));
  const minutes = digits.length > 2 ? Number(digits.slice(2, 4)) : 0;
  return sign * (hours * 60 + minutes);
}

function fieldsToWall(
  text: string,
  year: number,
  month: number,
  day: number,
  time: string[],
): ParsedDateTime | { error: string } {
  if (year < 1900 || month < 1 || month > 12) {
    return { error: `"${text}" is not a date` };
  }
  if (day < 1 || day > daysInMonth(year, month)) {
    return {
      error: `"${text}" is not a date: that month has ${daysInMonth(year, month)} days`,
    };
  }
  const hasTime = time[0] !== undefined;
  const hour = hasTime ? Number(time[0]) : 0;
  const minute = hasTime ? Number(time[1]) : 0;
  const second = time[2] !== undefined ? Number(time[2]) : 0;
  const endOfDay = hour === 24 && minute === 0 && second === 0;
  if ((hour > 23 && !endOfDay) || minute > 59 || second > 59) {
    return { error: `"${text}" is not a time of day` };
  }
  return {
    wall: Date.UTC(year, month - 1, day, hour, minute, second),
    hasTime,
  };
}

/** Reads one date or date-time text in the given order; ISO text is read whatever the order. */
export function parseDateText(
  raw: string,
  order: DateOrder,
): ParsedDateTime | { error: string } {
  const text = raw.trim();
  const iso = YEAR_FIRST.exec(text);
  if (iso) {
    const parsed = fieldsToWall(text, +iso[1], +iso[2], +iso[3], [
      iso[4],
      iso[5],
      iso[6],
    ]);
    const offsetMinutes = offsetOf(iso[7]);
    if ("error" in parsed || offsetMinutes === undefined) return parsed;
    return { ...parsed, offsetMinutes };
  }
  const slashed = YEAR_LAST.exec(text);
  if (slashed && order !== "ymd") {
    const [first, second] = [+slashed[1], +slashed[2]];
    const [day, month] = order === "dmy" ? [first, second] : [second, first];
    if (month > 12) {
      return {
        error: `"${text}" is not a date read as ${DATE_ORDER_NAMES[order]}: ${month} is not a month`,
      };
    }
    return fieldsToWall(text, +slashed[3], month, day, [
      slashed[4],
      slashed[5],
      slashed[6],
    ]);
  }
  return {
    error: `"${text}" is not a date and time in a known format (dd/mm/yyyy hh:mm, yyyy-mm-dd hh:mm or ISO 8601)`,
  };
}

/** A spreadsheet serial date (days since 1899-12-30, the fraction the time of day) as wall-clock time, to the second. */
export function serialToWall(serial: number, date1904: boolean): number {
  const days = serial + (date1904 ? DATE_1904_SHIFT : 0) - SERIAL_UNIX_EPOCH;
  // Serials are binary fractions of a day: 00:30 is 0.020833…, so round.
  return Math.round((days * DAY_MS) / 1000) * 1000;
}

/**
 * parseDateText with its answers remembered: a file of 50 meters writes each
 * half-hour's time 50 times, and a year has 17,520 of them. Cleared when it
 * grows past `limit` so that a file of all-distinct times stays bounded.
 */
export class DateTextCache {
  private readonly answers = new Map<
    string,
    ParsedDateTime | { error: string }
  >();

  constructor(
    private readonly order: DateOrder,
    private readonly limit = 100_000,
  ) {}

  parse(text: string): ParsedDateTime | { error: string } {
    let answer = this.answers.get(text);
    if (answer === undefined) {
      if (this.answers.size >= this.limit) this.answers.clear();
      answer = parseDateText(text, this.order);
      this.answers.set(text, answer);
    }
    return answer;
  }
}

/** Any cell of a date or time column; null for a blank one. */
export function readDateCell(
  cell: Cell,
  order: DateOrder | DateTextCache,
  date1904: boolean,
): DateCellResult {
  if (cell === null || isBlank(cell)) return null;
  if (cell instanceof Date) {
    // Spreadsheet readers hand over a date cell's fields as UTC: they are
    // the wall-clock time written in the cell, with no zone.
    const wall = cell.getTime();
    return Number.isNaN(wall)
      ? { error: "the cell is not a valid date" }
      : { wall, hasTime: true };
  }
  if (typeof cell === "number") {
    // 1 = 1900-01-01 … 2958465 = 9999-12-31: the serials a spreadsheet shows as dates.
    if (cell >= 1 && cell < 2_958_466) {
      return { wall: serialToWall(cell, date1904), hasTime: true };
    }
    return { error: `${cell} is not a date` };
  }
  if (typeof cell === "boolean") return { error: `${cell} is not a date` };
  return typeof order === "string"
    ? parseDateText(cell, order)
    : order.parse(cell);
}

export interface DateOrderGuess {
  order: DateOrder;
  /** Said beside the preview when the order was a choice, e.g. 01/02 read as 1 February. */
  note: string | null;
}

/**
 * Works out from a column's values whether its slashed dates are day first or
 * month first. A value whose first number is over 12 settles day first, one
 * whose second number is over 12 settles month first; with neither (every day
 * of the file is the 12th or earlier) the file is read day first, the UK
 * convention the trade's files follow, and the note says so.
 */
export function detectDateOrder(
  cells: Iterable<Cell>,
  columnName: string,
): DateOrderGuess {
  let slashed = 0;
  let yearFirst = 0;
  let dayFirstExample: string | null = null;
  let monthFirstExample: string | null = null;
  let firstExample: string | null = null;
  for (const cell of cells) {
    if (typeof cell !== "string") continue;
    const text = cell.trim();
    if (YEAR_FIRST.test(text)) {
      yearFirst++;
      continue;
    }
    const m = YEAR_LAST.exec(text);
    if (!m) continue;
    slashed++;
    firstExample ??= text;
    if (+m[1] > 12) dayFirstExample ??= text;
    if (+m[2] > 12) monthFirstExample ??= text;
    // Day first is settled for good once seen (a month-first value would be a mix).
    if (dayFirstExample !== null && monthFirstExample !== null) break;
  }
  const where = `Dates in column "${columnName}"`;
  if (slashed === 0 || yearFirst > slashed) return { order: "ymd", note: null };
  if (dayFirstExample !== null && monthFirstExample !== null) {
    return {
      order: "dmy",
      note: `${where} mix day/month/year ("${dayFirstExample}") and month/day/year ("${monthFirstExample}"): read as day/month/year, the UK convention; the others are refused.`,
    };
  }
  if (dayFirstExample !== null) {
    return {
      order: "dmy",
      note: `${where} read as ${DATE_ORDER_NAMES.dmy}: "${dayFirstExample}" can only be day first.`,
    };
  }
  if (monthFirstExample !== null) {
    return {
      order: "mdy",
      note: `${where} read as ${DATE_ORDER_NAMES.mdy}: "${monthFirstExample}" can only be month first.`,
    };
  }
  return {
    order: "dmy",
    note: `${where} read as ${DATE_ORDER_NAMES.dmy}, the UK convention: no day in the column is over 12, so "${firstExample}" could be read either way. Choose month/day/year if the file is American.`,
  };
}
