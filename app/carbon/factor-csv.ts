/**
 * A factor file: one set a row, columns
 * `year,carrier,location_kg_per_kwh,market_kg_per_kwh,scope3_kg_per_kwh,source,version`
 * (market and scope 3 may be empty). Every row is checked with the same
 * schema as the API body; a file is stored whole or not at all.
 */
import Papa from "papaparse";
import {
  factorSetInputSchema,
  MAX_SETS_PER_UPLOAD,
  type FactorSetInput,
} from "./factor-schema";

export const FACTOR_COLUMNS = [
  "year",
  "carrier",
  "location_kg_per_kwh",
  "market_kg_per_kwh",
  "scope3_kg_per_kwh",
  "source",
  "version",
] as const;
export const MAX_FACTOR_BYTES = 200_000;

export interface FactorRowProblem {
  /** The spreadsheet row: the header is row 1. */
  row: number;
  message: string;
}

export type FactorCsvParse =
  | { ok: true; sets: FactorSetInput[] }
  | { ok: false; file?: string; problems: FactorRowProblem[] };

export function parseFactorCsv(text: string): FactorCsvParse {
  if (text.length > MAX_FACTOR_BYTES)
    return { ok: false, file: "The file is larger than 200 kB.", problems: [] };
  const parsed = Papa.parse<Record<string, string>>(text.trim(), {
    header: true,
    skipEmptyLines: true,
    transformHeader: (h) => h.trim().toLowerCase(),
  });
  const columns = parsed.meta.fields ?? [];
  const missing = FACTOR_COLUMNS.filter(
    (c) =>
      !["market_kg_per_kwh", "scope3_kg_per_kwh"].includes(c) &&
      !columns.includes(c),
  );
  if (missing.length)
    return {
      ok: false,
      file: `The file needs the columns ${FACTOR_COLUMNS.join(", ")}; missing: ${missing.join(", ")}.`,
      problems: [],
    };
  if (parsed.data.length === 0)
    return { ok: false, file: "The file has no rows.", problems: [] };
  if (parsed.data.length > MAX_SETS_PER_UPLOAD)
    return {
      ok: false,
      file: `At most ${MAX_SETS_PER_UPLOAD} rows a file.`,
      problems: [],
    };
  const sets: FactorSetInput[] = [];
  const problems: FactorRowProblem[] = [];
  const seen = new Set<string>();
  parsed.data.forEach((raw, i) => {
    const row = i + 2;
    const fields = Object.fromEntries(
      FACTOR_COLUMNS.map((c) => [c, (raw[c] ?? "").trim()]),
    );
    const result = factorSetInputSchema.safeParse(fields);
    if (!result.success) {
      for (const issue of result.error.issues)
        problems.push({ row, message: issue.message });
      return;
    }
    const key = `${result.data.year}:${result.data.carrier}`;
    if (seen.has(key)) {
      problems.push({
        row,
        message: `${result.data.year} ${result.data.carrier} is listed twice.`,
      });
      return;
    }
    seen.add(key);
    sets.push(result.data);
  });
  return problems.length ? { ok: false, problems } : { ok: true, sets };
}
