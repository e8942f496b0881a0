/**
 * An organisation's financial year and its quarters, as site-local calendar
 * months (the ledger's months). A financial year is named by the calendar
 * year it starts in: with an April start, FY 2025 runs April 2025 – March
 * 2026 and is written "FY 2025/26"; with a January start it is the calendar
 * year, "FY 2025". Pure: no database; read in the browser too.
 */

import { MONTH_NAMES } from "~/lib/format";

export { MONTH_NAMES };

export interface MonthSpan {
  /** First and last month, YYYY-MM, both included. */
  from: string;
  to: string;
  /** Every month, YYYY-MM, in order. */
  months: string[];
  label: string;
}

export function isStartMonth(value: unknown): value is number {
  return Number.isInteger(value) && Number(value) >= 1 && Number(value) <= 12;
}

function monthAt(year: number, zeroBasedIndex: number): string {
  const y = year + Math.floor(zeroBasedIndex / 12);
  const m = (((zeroBasedIndex % 12) + 12) % 12) + 1;
  return `${String(y).padStart(4, "0")}-${String(m).padStart(2, "0")}`;
}

/** "FY 2025/26" when the year spans two calendar years, else "FY 2025". */
export function financialYearLabel(year: number, startMonth: number): string {
  if (startMonth === 1) return `FY ${year}`;
  return `FY ${year}/${String((year + 1) % 100).padStart(2, "0")}`;
}

/** The financial year (named by its starting calendar year) a month YYYY-MM falls in. */
export function financialYearOf(month: string, startMonth: number): number {
  const [y, m] = month.split("-").map(Number);
  return m >= startMonth ? y : y - 1;
}

function span(
  year: number,
  firstIndex: number,
  count: number,
  label: string,
): MonthSpan {
  const months = Array.from({ length: count }, (_, i) =>
    monthAt(year, firstIndex + i),
  );
  return { from: months[0], to: months[count - 1], months, label };
}

/** The twelve months of financial year `year`. */
export function financialYear(year: number, startMonth: number): MonthSpan {
  return span(year, startMonth - 1, 12, financialYearLabel(year, startMonth));
}

/** Quarter 1–4 of financial year `year`: Q1 starts in the year's first month. */
export function financialQuarter(
  year: number,
  quarter: number,
  startMonth: number,
): MonthSpan {
  return span(
    year,
    startMonth - 1 + (quarter - 1) * 3,
    3,
    `Q${quarter} ${financialYearLabel(year, startMonth)}`,
  );
}

/** The quarter (1–4) of its financial year a month YYYY-MM falls in. */
export function financialQuarterOf(month: string, startMonth: number): number {
  const m = Number(month.slice(5, 7));
  return Math.floor((((m - startMonth + 12) % 12) / 3) % 4) + 1;
}

export interface PeriodPick {
  /** "fy:2025" or "fq:2025-Q1", as the Ledger's period picker sends it. */
  value: string;
  label: string;
  from: string;
  to: string;
}

/**
 * The financial years and quarters worth offering around a month: the year
 * containing `month` and the `yearsBack` before it, newest first, each
 * followed by its quarters.
 */
export function periodPicks(
  month: string,
  startMonth: number,
  yearsBack = 3,
): PeriodPick[] {
  const current = financialYearOf(month, startMonth);
  const picks: PeriodPick[] = [];
  for (let year = current; year >= current - yearsBack; year--) {
    const fy = financialYear(year, startMonth);
    picks.push({
      value: `fy:${year}`,
      label: fy.label,
      from: fy.from,
      to: fy.to,
    });
    for (let q = 1; q <= 4; q++) {
      const fq = financialQuarter(year, q, startMonth);
      picks.push({
        value: `fq:${year}-Q${q}`,
        label: fq.label,
        from: fq.from,
        to: fq.to,
      });
    }
  }
  return picks;
}
