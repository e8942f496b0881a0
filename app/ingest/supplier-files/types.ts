/**
 * Shared shapes of the supplier-file parsing layer: a file read into rows of
 * cells, and what parsing them gives back. Pure data, usable on the server and
 * in the browser.
 */

/** One cell as a reader hands it over; blank cells are null or "". */
export type Cell = string | number | boolean | Date | null;

/** A row of a file with the number a spreadsheet program shows for it (1-based, header included). */
export interface SheetRow {
  number: number;
  cells: Cell[];
}

/** A file read into rows; rows with no content at all are left out, numbers kept. */
export interface Sheet {
  rows: SheetRow[];
  /**
   * Workbooks saved with the 1904 date system count serial dates from
   * 1904-01-01 instead of 1899-12-30; CSV files never do.
   */
  date1904: boolean;
}

/** The header row (its column names) and the data rows under it. */
export interface Table {
  header: string[];
  headerRowNumber: number;
  rows: SheetRow[];
  date1904: boolean;
}

/** `interval_energy` reading (shared/design.md, "Data in"): energy_kwh ≥ 0, instants in UTC. */
export interface IntervalEnergyReading {
  meter: string;
  quantity: "interval_energy";
  start: string;
  end: string;
  energy_kwh: number;
}

/** A refusal tied to a place in the file: row as a spreadsheet shows it, column by header name or letter. */
export interface RowError {
  row: number;
  column: string;
  message: string;
}

export interface ParseResult {
  readings: IntervalEnergyReading[];
  /** readingRows[i] is the spreadsheet row readings[i] came from. */
  readingRows: number[];
  /** The first `maxErrors` refusals, in file order. */
  errors: RowError[];
  /** All refusals, including those past `maxErrors`. */
  errorCount: number;
  /** What the parser decided on the person's behalf (date order, layout details), to show beside the preview. */
  notes: string[];
}

export type IntervalMinutes = 15 | 30 | 60;
export const INTERVAL_MINUTES: readonly IntervalMinutes[] = [15, 30, 60];
