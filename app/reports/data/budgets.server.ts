/**
 * The report's budgets: those of the financial year the period ends in, with
 * actual to date and the forecast to year end, and the estate's carbon
 * target. The figures are the Overview's (app/budgets), so a report and the
 * screen never disagree.
 */
import { yearProgress } from "~/budgets/budget-progress.server";
import { financialYearStart } from "~/financial-year/financial-year.server";
import type { ReportBudgets } from "./types";

/** The financial year (its first calendar year) that contains `month` (YYYY-MM). */
function yearOf(month: string, startMonth: number): number {
  const year = Number(month.slice(0, 4));
  return Number(month.slice(5, 7)) >= startMonth ? year : year - 1;
}

export async function reportBudgets(args: {
  organizationId: string;
  /** Null: all sites, with the carbon target; else that site's budgets only. */
  siteId: string | null;
  /** The period's last month, YYYY-MM. */
  lastMonth: string;
  /** Months before this one's count as actual. */
  generatedAt: Date;
}): Promise<ReportBudgets> {
  const startMonth = await financialYearStart(args.organizationId);
  const progress = await yearProgress({
    organizationId: args.organizationId,
    year: yearOf(args.lastMonth, startMonth),
    now: args.generatedAt,
    startMonth,
  });
  const target = args.siteId === null ? progress.carbon : null;
  return {
    label: progress.label,
    lastMonthToDate: progress.lastMonthToDate,
    rows: progress.budgets
      .filter((b) => args.siteId === null || b.budget.site_id === args.siteId)
      .map(({ budget, energy, money }) => ({
        siteName: budget.site_name,
        carrier: budget.carrier,
        budgetKwh: energy.budget,
        actualKwhToDate: energy.actualToDate,
        forecastKwh: energy.forecast,
        money:
          money && budget.currency
            ? {
                currency: budget.currency,
                budget: money.budget,
                actualToDate: money.actualToDate,
                forecast: money.forecast,
              }
            : null,
      })),
    carbon: target && {
      reductionPercent: target.target.reduction_percent,
      baseYear: target.target.base_year,
      basis: target.target.basis,
      allowedKg: target.allowedKg,
      actualKgToDate: target.progress.actualToDate,
      forecastKg: target.progress.forecast,
    },
  };
}
