/**
 * The period a report covers: a month, a quarter or a calendar year, as
 * site-local calendar months (the ledger's months). Pure: no database.
 */
import { z } from "zod";
import { monthLong } from "~/lib/format";
import { MONTH_PATTERN } from "~/lib/months";

export const periodKinds = ["month", "quarter", "year"] as const;
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
};

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
export function reportPeriod(kind: PeriodKind, anchor: string): ReportPeriod {
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
  return build(kind, year, 0, 12, String(year));
}

/** The anchor of the period of `kind` that contains a month (YYYY-MM). */
export function anchorFor(kind: PeriodKind, month: string): string {
  const [year, m] = month.split("-");
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
    kind: z.enum(periodKinds, { error: "Choose a month, quarter or year." }),
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
