import { monthsBetween } from "~/baselines/degree-days";
import { eq, max, min } from "drizzle-orm";
import { db } from "~/db/client.server";
import { monthlyRollups } from "~/db/schema";
import { monthLong } from "~/lib/format";
import { financialYearStart } from "~/financial-year/financial-year.server";
import { anchorFor, reportPeriod } from "./periods";

export interface PeriodOption {
  /** "month:2026-03", "quarter:2026-Q1" or "year:2026", as the form sends it */
  value: string;
  label: string;
}

export interface PeriodChoices {
  months: PeriodOption[];
  quarters: PeriodOption[];
  years: PeriodOption[];
  /** The organisation's financial years and their quarters. */
  financial: PeriodOption[];
  /** The latest whole month with data: the sensible default. */
  suggested: string | null;
}

/**
 * The periods worth offering: every month, quarter and year from the first
 * month with ledger data to the last, newest first.
 */
export async function periodChoices(
  organizationId: string,
): Promise<PeriodChoices> {
  const [range] = await db
    .select({
      first: min(monthlyRollups.month),
      last: max(monthlyRollups.month),
    })
    .from(monthlyRollups)
    .where(eq(monthlyRollups.organizationId, organizationId));
  // Months are stored as their first day; the choices speak in YYYY-MM.
  const first = range?.first?.slice(0, 7);
  const last = range?.last?.slice(0, 7);
  if (!first || !last)
    return {
      months: [],
      quarters: [],
      years: [],
      financial: [],
      suggested: null,
    };
  const months = monthsBetween(first, last).reverse();
  const quarters = [...new Set(months.map((m) => anchorFor("quarter", m)))];
  const years = [...new Set(months.map((m) => anchorFor("year", m)))];
  const fyStart = await financialYearStart(organizationId);
  const financial = [
    ...new Set(
      months.flatMap((m) => [
        `financial_year:${anchorFor("financial_year", m, fyStart)}`,
        `financial_quarter:${anchorFor("financial_quarter", m, fyStart)}`,
      ]),
    ),
  ].map((value) => {
    const [kind, anchor] = value.split(":") as [
      "financial_year" | "financial_quarter",
      string,
    ];
    return { value, label: reportPeriod(kind, anchor, fyStart).label };
  });
  return {
    months: months.map((m) => ({
      value: `month:${m}`,
      label: monthLong(m),
    })),
    quarters: quarters.map((q) => ({
      value: `quarter:${q}`,
      label: q.replace("-", " "),
    })),
    years: years.map((y) => ({ value: `year:${y}`, label: y })),
    financial,
    suggested: months[1] ? `month:${months[1]}` : `month:${months[0]}`,
  };
}
