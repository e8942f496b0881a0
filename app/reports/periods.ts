/**
 * The period a report covers: a month, a quarter or a calendar year, as
 * site-local calendar months (the ledger's months). Pure: no database.
 */
import { z } from "zod";
import { monthLong } from "~/lib/format";
import { MONTH_PATTERN } from "~/lib/months";
import {
  financialQuarter,
  financialQuarterOf,
  financialYear,
  financialYearOf,
  type MonthSpan,
} from "~/financial-year/financial-year";

export const periodKinds = [
  "month",
  "quarter",
  "year",
  "financial_year",
  "financial_quarter",
] as const;
export type PeriodKind = (typeof periodKinds)[number];

export interface ReportPeriod {
  kind: PeriodKind;
  /** First day of the period, YYYY-MM-01. */
  start: string;
  /** First day after the period (exclusive), YYYY-MM-01. */
  end: string;
  /** Each month of the period, YYYY-MM-01, in order. */
  months: string[];
  /** "March 2026", "Q1 2026" or "2026". */
  label: string;
}

/** Years a report may cover: the same range the rest of the app accepts for dates. */
export const FIRST_YEAR = 1990;
export const LAST_YEAR = 2100;

const ANCHOR: Record<PeriodKind, { pattern: RegExp; example: string }> = {
  month: { pattern: MONTH_PATTERN, example: "2026-03" },
  quarter: { pattern: /^(\d{4})-Q([1-4])$/, example: "2026-Q1" },
  year: { pattern: /^(\d{4})$/, example: "2026" },
  // A financial year is named by the calendar year it starts in.
  financial_year: { pattern: /^(\d{4})$/, example: "2025" },
  financial_quarter: { pattern: /^(\d{4})-Q([1-4])$/, example: "2025-Q1" },
};

function fromSpan(kind: PeriodKind, span: MonthSpan): ReportPeriod {
  const [y, m] = span.to.split("-").map(Number);
  return {
    kind,
    start: `${span.from}-01`,
    end: firstOfMonth(y, m),
    months: span.months.map((month) => `${month}-01`),
    label: span.label,
  };
}

function firstOfMonth(year: number, monthIndex: number): string {
  const y = year + Math.floor(monthIndex / 12);
  const m = (monthIndex % 12) + 1;
  return `${String(y).padStart(4, "0")}-${String(m).padStart(2, "0")}-01`;
}

function build(
  kind: PeriodKind,
  year: number,
  firstMonthIndex: number,
  count: number,
  label: string,
): ReportPeriod {
  const months = Array.from({ length: count }, (_, i) =>
    firstOfMonth(year, firstMonthIndex + i),
  );
  return {
    kind,
    start: months[0],
    end: firstOfMonth(year, firstMonthIndex + count),
    months,
    label,
  };
}

/**
 * The period of `kind` named by `anchor`: "YYYY-MM" for a month, "YYYY-Qn"
 * for a quarter, "YYYY" for a year. Throws an Error saying what was expected.
 */
export function reportPeriod(
  kind: PeriodKind,
  anchor: string,
  /** The month (1–12) the organisation's financial year starts in. */
  financialYearStart = 1,
): ReportPeriod {
  if (!(periodKinds as readonly string[]).includes(kind))
    throw new Error(
      `Unknown period kind "${String(kind)}": use month, quarter or year.`,
    );
  const { pattern, example } = ANCHOR[kind];
  const match = pattern.exec(typeof anchor === "string" ? anchor.trim() : "");
  if (!match)
    throw new Error(
      `"${String(anchor)}" does not name a ${kind}: write it like ${example}.`,
    );
  const year = Number(match[1]);
  if (year < FIRST_YEAR || year > LAST_YEAR)
    throw new Error(
      `A report covers a year from ${FIRST_YEAR} to ${LAST_YEAR}, not ${year}.`,
    );
  if (kind === "month") {
    const index = Number(match[2]) - 1;
    return build(kind, year, index, 1, monthLong(match[0]));
  }
  if (kind === "quarter") {
    const quarter = Number(match[2]);
    return build(kind, year, (quarter - 1) * 3, 3, `Q${quarter} ${year}`);
  }
  if (kind === "financial_year")
    return fromSpan(kind, financialYear(year, financialYearStart));
  if (kind === "financial_quarter")
    return fromSpan(
      kind,
      financialQuarter(year, Number(match[2]), financialYearStart),
    );
  return build(kind, year, 0, 12, String(year));
}

/** The anchor of the period of `kind` that contains a month (YYYY-MM). */
export function anchorFor(
  kind: PeriodKind,
  month: string,
  financialYearStart = 1,
): string {
  const [year, m] = month.split("-");
  if (kind === "financial_year")
    return String(financialYearOf(month, financialYearStart));
  if (kind === "financial_quarter")
    return `${financialYearOf(month, financialYearStart)}-Q${financialQuarterOf(month, financialYearStart)}`;
  if (kind === "month") return `${year}-${m}`;
  if (kind === "quarter") return `${year}-Q${Math.ceil(Number(m) / 3)}`;
  return year;
}

/**
 * The form fields of a new report (`kind`, `anchor`), parsed into a period;
 * a bad anchor is an issue on the `anchor` field.
 */
export const reportPeriodFields = z
  .object({
    kind: z.enum(periodKinds, {
      error: "Choose a month, quarter, year, financial year or its quarter.",
    }),
    anchor: z.string().trim().min(1, "Choose the period.").max(16),
  })
  .transform((fields, ctx) => {
    try {
      return reportPeriod(fields.kind, fields.anchor);
    } catch (error) {
      ctx.addIssue({
        code: "custom",
        path: ["anchor"],
        message: (error as Error).message,
      });
      return z.NEVER;
    }
  });
