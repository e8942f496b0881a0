/** What the two layouts share: the meter of a row, the mapping's checks, instants as ISO text. */
import type { DateOrder } from "./date-text";
import type { Cell, Table } from "./types";
import { columnLabel, columnLetter, isBlank } from "./columns";

/** The meter of each row: a column of meter codes, or one meter chosen for the whole file. */
export type MeterSource = { column: number } | { code: string };

export interface ParseOptions {
  /** The site's IANA time zone, e.g. "Europe/London"; times without an offset are read in it. "UTC" for files kept in GMT all year. */
  timeZone: string;
  /** Overrides the date order found from the file (see detectDateOrder). */
  dateOrder?: DateOrder;
  /** How many refusals to list (all are counted); 1,000 when absent. */
  maxErrors?: number;
}

/** The reading schema's limit on a meter code (app/ingest/reading-schema.ts). */
const METER_CODE_MAX = 64;

export function meterOf(
  source: MeterSource,
  cells: Cell[],
  header: readonly string[],
): { code: string } | { error: string; column: string } {
  if ("code" in source) return { code: source.code.trim() };
  const cell = cells[source.column];
  const column = columnLabel(header, source.column);
  if (cell === null || cell === undefined || isBlank(cell)) {
    return { error: "no meter code", column };
  }
  const code = String(cell).trim();
  if (code.length > METER_CODE_MAX) {
    return {
      error: `the meter code is longer than ${METER_CODE_MAX} characters`,
      column,
    };
  }
  return { code };
}

/** Mapping mistakes, said against the header row: a column past the last, or no meter chosen. */
export function mappingErrors(
  table: Table,
  columns: Record<string, number>,
  meter: MeterSource,
): string[] {
  const all = "column" in meter ? { meter: meter.column, ...columns } : columns;
  const problems: string[] = [];
  for (const [role, index] of Object.entries(all)) {
    if (!Number.isInteger(index) || index < 0 || index >= table.header.length) {
      problems.push(
        `The ${role} column is not one of the file's ${table.header.length} columns (${table.header.length ? `A to ${columnLetter(table.header.length - 1)}` : "none"}).`,
      );
    }
  }
  if ("code" in meter && meter.code.trim() === "") {
    problems.push(
      "Choose the meter the file is for, or the column that holds meter codes.",
    );
  }
  return problems;
}

/**
 * Instants as ISO text, each made once: a file repeats the same half-hours
 * for every meter, and a year has 17,520 of them. Keyed by whole minutes,
 * which V8 keeps as small integers (milliseconds since 1970 are boxed
 * doubles, several times slower to look up); other instants are not cached.
 */
export class IsoText {
  private readonly cache = new Map<number, string>();

  of(instant: number): string {
    const minute = instant / 60_000;
    if (!Number.isInteger(minute)) return new Date(instant).toISOString();
    let text = this.cache.get(minute);
    if (text === undefined) {
      text = new Date(instant).toISOString();
      this.cache.set(minute, text);
    }
    return text;
  }
}

const pad = (n: number) => String(n).padStart(2, "0");

/** A wall-clock date as the UK writes it: 29/03/2026. */
export function formatWallDate(wall: number): string {
  const d = new Date(wall);
  return `${pad(d.getUTCDate())}/${pad(d.getUTCMonth() + 1)}/${d.getUTCFullYear()}`;
}

/** A wall-clock time of day: 01:30. */
export function formatWallTime(wall: number): string {
  const d = new Date(wall);
  return `${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}`;
}

/** "an hour", "30 minutes": how far the clocks move. */
export function clockShift(minutes: number): string {
  const m = Math.abs(minutes);
  return m === 60
    ? "an hour"
    : m % 60 === 0
      ? `${m / 60} hours`
      : `${m} minutes`;
}

/** "half-hours", "hours", "quarter-hours" for a resolution. */
export function intervalWord(minutes: number): string {
  return minutes === 30
    ? "half-hours"
    : minutes === 60
      ? "hours"
      : minutes === 15
        ? "quarter-hours"
        : `${minutes}-minute intervals`;
}
