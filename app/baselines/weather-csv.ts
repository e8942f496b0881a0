// A weather file: one row per site-local day, columns `date,mean_temp_c`.
// The same checks run in the browser (for the preview) and on the server
// (which alone decides): a file is stored whole or not at all.

import Papa from "papaparse";
import { z } from "zod";
import { formatCount } from "~/lib/format";

export const WEATHER_COLUMNS = ["date", "mean_temp_c"] as const;
/** About 30 years of days. */
export const MAX_WEATHER_ROWS = 11_000;
export const MAX_WEATHER_BYTES = 1_000_000;
/** Problems listed for one file; the rest are counted. */
export const MAX_LISTED_PROBLEMS = 200;

export interface WeatherRow {
  day: string;
  meanTempC: number;
}

export interface RowProblem {
  /** The spreadsheet row: the header is row 1. */
  row: number;
  message: string;
}

export type WeatherParse =
  | { ok: true; rows: WeatherRow[] }
  | {
      ok: false;
      /** A problem with the file as a whole (columns, size, no rows). */
      file?: string;
      problems: RowProblem[];
      problemCount: number;
    };

/** What the page's upload form is answered: stored (`message`) or why not. */
export interface WeatherUploadResult {
  intent: "upload-weather";
  errors: Record<string, string>;
  problems?: RowProblem[];
  problemCount?: number;
  message?: string;
}

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

function isCalendarDay(value: string): boolean {
  const match = DATE.exec(value);
  if (!match) return false;
  const [y, m, d] = match.slice(1).map(Number);
  const date = new Date(Date.UTC(y, m - 1, d));
  return (
    y >= 1900 &&
    y <= 2100 &&
    date.getUTCFullYear() === y &&
    date.getUTCMonth() === m - 1 &&
    date.getUTCDate() === d
  );
}

/** A decimal number as written in a file: no exponents, no thousands marks. */
const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)$/;

export const weatherRowSchema = z.strictObject({
  date: z.string({ error: "date: missing" }).trim().refine(isCalendarDay, {
    error: "date: use a calendar day from 1900 to 2100, like 2025-01-31",
  }),
  mean_temp_c: z
    .string({ error: "mean_temp_c: missing" })
    .trim()
    .refine((v) => DECIMAL.test(v), {
      error: "mean_temp_c: must be a number in °C, like -3.5 or 12.25",
    })
    .transform(Number)
    .refine((v) => v >= -90 && v <= 60, {
      error: "mean_temp_c: must be from -90 to 60 °C",
    })
    // The column keeps hundredths of a kelvin.
    .transform((v) => Math.round(v * 100) / 100),
});

/** Checks rows as parsed from a file with a header (each a column → cell map). */
export function checkWeatherRows(
  records: readonly Record<string, unknown>[],
): WeatherParse {
  if (records.length === 0)
    return {
      ok: false,
      file: "The file has a header but no rows.",
      problems: [],
      problemCount: 0,
    };
  if (records.length > MAX_WEATHER_ROWS)
    return {
      ok: false,
      file: `The file has ${formatCount(records.length)} rows; send at most ${formatCount(MAX_WEATHER_ROWS)} at a time.`,
      problems: [],
      problemCount: 0,
    };
  const rows: WeatherRow[] = [];
  const problems: RowProblem[] = [];
  let problemCount = 0;
  const seen = new Map<string, number>();
  const report = (row: number, message: string) => {
    problemCount += 1;
    if (problems.length < MAX_LISTED_PROBLEMS) problems.push({ row, message });
  };
  records.forEach((record, index) => {
    const row = index + 2;
    const cells: Record<string, unknown> = {};
    for (const column of WEATHER_COLUMNS)
      if (record[column] !== undefined && record[column] !== "")
        cells[column] = record[column];
    const extra = Object.keys(record).filter(
      (k) =>
        !(WEATHER_COLUMNS as readonly string[]).includes(k) &&
        record[k] !== undefined &&
        record[k] !== "",
    );
    if (extra.length > 0) {
      report(row, `unexpected value in ${extra.join(", ")}`);
      return;
    }
    const parsed = weatherRowSchema.safeParse(cells);
    if (!parsed.success) {
      report(row, parsed.error.issues.map((i) => i.message).join("; "));
      return;
    }
    const day = parsed.data.date;
    const earlier = seen.get(day);
    if (earlier !== undefined) {
      report(row, `date: ${day} is already on row ${earlier}`);
      return;
    }
    seen.set(day, row);
    rows.push({ day, meanTempC: parsed.data.mean_temp_c });
  });
  if (problemCount > 0) return { ok: false, problems, problemCount };
  return { ok: true, rows };
}

/** Parses a weather file's text: a header row, then one row per day. */
export function parseWeatherCsv(text: string): WeatherParse {
  const result = Papa.parse<Record<string, string>>(
    text.replace(/^\uFEFF/, ""),
    {
      header: true,
      skipEmptyLines: "greedy",
      transformHeader: (h) => h.trim().toLowerCase(),
    },
  );
  const headers = result.meta.fields ?? [];
  const missing = WEATHER_COLUMNS.filter((c) => !headers.includes(c));
  if (missing.length > 0)
    return {
      ok: false,
      file: `The file has no ${missing.join(" or ")} column. The header row is: date,mean_temp_c`,
      problems: [],
      problemCount: 0,
    };
  const malformed = result.errors.filter((e) => e.type !== "Delimiter");
  if (malformed.length > 0) {
    const problems = malformed.slice(0, MAX_LISTED_PROBLEMS).map((e) => ({
      row: (e.row ?? 0) + 2,
      message: e.message,
    }));
    return { ok: false, problems, problemCount: malformed.length };
  }
  return checkWeatherRows(result.data);
}
