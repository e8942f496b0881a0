/**
 * Calorific values of a gas supply (issue #15): one per site-local month, or
 * per single day, each with its basis (gross or net) and where it came from.
 * A gas reading that does not carry its own CV takes the CV in effect on its
 * interval's site-local day: the day's own value if there is one, else its
 * month's. Pure: the entry rules, the lookup and the CSV rows; the writes
 * and the recomputation are in calorific-values.server.ts.
 */
import Papa from "papaparse";
import { z } from "zod";
import { storableText } from "../lib/storable-text";
import {
  CUBIC_METRES_PER_CUBIC_FOOT,
  GAS_RANGES,
  type CvBasis,
} from "../physics/gas-volume";

export const cvBases = ["gross", "net"] as const satisfies readonly CvBasis[];
export const cvPeriodKinds = ["month", "day"] as const;
export type CvPeriodKind = (typeof cvPeriodKinds)[number];

/** 1 hcf (hundred cubic feet) = 100 × 0.028316846592 m³ = 2.8316846592 m³, exactly. */
export const CUBIC_METRES_PER_HCF = 100 * CUBIC_METRES_PER_CUBIC_FOOT;

export const gasRegisterUnits = ["m3", "hcf"] as const;
export type GasRegisterUnit = (typeof gasRegisterUnits)[number];

export const gasRegisterUnitLabels: Record<GasRegisterUnit, string> = {
  m3: "Cubic metres (m³)",
  hcf: "Hundreds of cubic feet (hcf)",
};

/** Cubic metres of one unit of a register. */
export function cubicMetresPerUnit(unit: GasRegisterUnit): number {
  return unit === "m3" ? 1 : CUBIC_METRES_PER_HCF;
}

const MONTH = /^(\d{4})-(0[1-9]|1[0-2])$/;
const DAY = /^(\d{4})-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;

export interface CvPeriod {
  kind: CvPeriodKind;
  /** The month's first day, or the day: YYYY-MM-DD. */
  start: string;
}

/** "2026-03" is a month, "2026-03-15" a day; anything else is null. */
export function parseCvPeriod(text: string): CvPeriod | null {
  const t = text.trim();
  if (MONTH.test(t)) return { kind: "month", start: `${t}-01` };
  const day = DAY.exec(t);
  if (!day) return null;
  // A day that does not exist (2026-02-30) is refused, not rolled over.
  const d = new Date(`${t}T00:00:00Z`);
  if (d.toISOString().slice(0, 10) !== t) return null;
  return { kind: "day", start: t };
}

/** The period as written: "2026-03" for a month, "2026-03-15" for a day. */
export function cvPeriodText(period: CvPeriod): string {
  return period.kind === "month" ? period.start.slice(0, 7) : period.start;
}

const { min: CV_MIN, max: CV_MAX } = GAS_RANGES.calorificValueMjM3;

/** One CV as the API, the page's form and a CSV row give it. */
export const calorificValueInputSchema = z.strictObject({
  period: z
    .string({
      error: "period: expected a month (2026-03) or a day (2026-03-15)",
    })
    .refine((p) => parseCvPeriod(p) !== null, {
      error: "period: expected a month (2026-03) or a day (2026-03-15)",
    }),
  calorific_value_mj_m3: z
    .number({
      error: `calorific_value_mj_m3: expected a number of MJ/m³ from ${CV_MIN} to ${CV_MAX}`,
    })
    .min(
      CV_MIN,
      `calorific_value_mj_m3: must be ${CV_MIN} to ${CV_MAX} MJ/m³ (natural gas is about 35–45)`,
    )
    .max(
      CV_MAX,
      `calorific_value_mj_m3: must be ${CV_MIN} to ${CV_MAX} MJ/m³ (natural gas is about 35–45)`,
    )
    .describe(
      `CV at 15 °C and 1013.25 mbar (EN ISO 13443), MJ/m³: ${CV_MIN} to ${CV_MAX}`,
    ),
  basis: z
    .enum(cvBases, { error: "basis: expected gross or net" })
    .default("gross")
    .describe("gross (higher, the default) or net (lower)"),
  source: storableText(
    z.string().trim().max(200, "source: at most 200 characters"),
    "source",
  )
    .optional()
    .describe("Where the value came from, e.g. the supplier's bill"),
});
export type CalorificValueInput = z.output<typeof calorificValueInputSchema>;

export interface CvEntry {
  kind: CvPeriodKind;
  start: string;
  cvMjM3: number;
  basis: CvBasis;
}

export type CvLookup = (day: string) => CvEntry | null;

/** The CV in effect on a site-local day (YYYY-MM-DD): the day's, else its month's. */
export function cvLookup(series: readonly CvEntry[]): CvLookup {
  const days = new Map<string, CvEntry>();
  const months = new Map<string, CvEntry>();
  for (const e of series) {
    if (e.kind === "day") days.set(e.start, e);
    else months.set(e.start.slice(0, 7), e);
  }
  return (day) => days.get(day) ?? months.get(day.slice(0, 7)) ?? null;
}

/** Whether a site-local day lies in a CV's period. */
export function dayInPeriod(day: string, period: CvPeriod): boolean {
  return period.kind === "day"
    ? day === period.start
    : day.slice(0, 7) === period.start.slice(0, 7);
}

// --------------------------------------------------------------- CSV ----

/** A CSV's columns: period, cv, basis; an optional source. */
export const CV_CSV_COLUMNS = ["period", "cv", "basis"] as const;
export const MAX_CV_ROWS = 1000;

export type CvCsvOutcome =
  | { ok: true; entries: CalorificValueInput[] }
  | { ok: false; errors: string[] };

/**
 * The rows of an uploaded CSV (period,cv,basis[,source]), each checked by
 * the same schema as the API; every bad row is named by its line, and a
 * file with any bad row stores nothing.
 */
export function parseCvCsv(text: string): CvCsvOutcome {
  const parsed = Papa.parse<Record<string, string>>(text.trim(), {
    header: true,
    skipEmptyLines: "greedy",
    transformHeader: (h) => h.trim().toLowerCase(),
  });
  const headers = parsed.meta.fields ?? [];
  const missing = CV_CSV_COLUMNS.filter((c) => !headers.includes(c));
  if (missing.length)
    return {
      ok: false,
      errors: [
        `The file needs the columns period, cv, basis; missing ${missing.join(", ")}.`,
      ],
    };
  if (parsed.data.length === 0)
    return { ok: false, errors: ["The file has no rows under its header."] };
  if (parsed.data.length > MAX_CV_ROWS)
    return { ok: false, errors: [`At most ${MAX_CV_ROWS} rows in one file.`] };
  const entries: CalorificValueInput[] = [];
  const errors: string[] = [];
  const seen = new Set<string>();
  parsed.data.forEach((row, i) => {
    const line = i + 2;
    const cell = (c: string) => (row[c] ?? "").trim();
    const cvText = cell("cv");
    const result = calorificValueInputSchema.safeParse({
      period: cell("period"),
      calorific_value_mj_m3: cvText === "" ? undefined : Number(cvText),
      basis: cell("basis") === "" ? undefined : cell("basis").toLowerCase(),
      ...(cell("source") ? { source: cell("source") } : {}),
    });
    if (!result.success) {
      errors.push(`Line ${line}: ${result.error.issues[0].message}`);
      return;
    }
    const key = result.data.period.trim();
    if (seen.has(key)) {
      errors.push(`Line ${line}: period ${key} appears twice in the file`);
      return;
    }
    seen.add(key);
    entries.push(result.data);
  });
  return errors.length ? { ok: false, errors } : { ok: true, entries };
}
