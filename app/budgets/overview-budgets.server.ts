/**
 * What the Overview shows of the current financial year's budgets: money
 * across carriers per currency (cost may be added across carriers), kWh per
 * carrier (never across carriers), and carbon against the target's path.
 * Figures for charts are numbers; the year's totals stay exact text.
 */
import { financialYearLabel } from "~/financial-year/financial-year";
import { monthShort } from "~/lib/format";
import { yearProgress, type BudgetProgress } from "./budget-progress.server";
import { budgetProgress, sumDecimals, type Progress } from "./progress";

export interface ChartMonth {
  month: string;
  label: string;
  budget: number;
  /** Months to date only. */
  actual: number | null;
  /** Months to come, and the last month to date so the dashed line joins. */
  forecast: number | null;
}

export interface BudgetSeries {
  key: string;
  title: string;
  /** "kWh", "kg CO₂e" or a currency code. */
  unit: string;
  months: ChartMonth[];
  budget: string;
  actualToDate: string;
  budgetToDate: string;
  forecast: string;
}

export interface OverviewBudgets {
  label: string;
  lastMonthToDate: string;
  series: BudgetSeries[];
  carbonTarget: {
    baseYearLabel: string;
    reductionPercent: string;
    basis: string;
    baseKg: string;
    allowedKg: string;
  } | null;
}

/** Several budgets' months added month by month, then the forecast again over the sum. */
function combine(parts: Progress[], lastMonthToDate: string, places: number) {
  const months = parts[0].months.map((m, i) => ({
    month: m.month,
    budget: sumDecimals(parts.map((p) => p.months[i].budget)),
    actual: sumDecimals(parts.map((p) => p.months[i].actual)),
  }));
  return budgetProgress(months, lastMonthToDate, places);
}

function chartMonths(p: Progress): ChartMonth[] {
  const lastToDate = p.months.filter((m) => m.toDate).at(-1)?.month;
  return p.months.map((m) => ({
    month: m.month,
    label: monthShort(m.month),
    budget: Number(m.budget),
    actual: m.toDate ? Number(m.forecast) : null,
    forecast: !m.toDate || m.month === lastToDate ? Number(m.forecast) : null,
  }));
}

function series(
  key: string,
  title: string,
  unit: string,
  p: Progress,
): BudgetSeries {
  return {
    key,
    title,
    unit,
    months: chartMonths(p),
    budget: p.budget,
    actualToDate: p.actualToDate,
    budgetToDate: p.budgetToDate,
    forecast: p.forecast,
  };
}

function groupBy<T>(items: T[], key: (t: T) => string): Map<string, T[]> {
  const groups = new Map<string, T[]>();
  for (const item of items)
    groups.set(key(item), [...(groups.get(key(item)) ?? []), item]);
  return groups;
}

export async function overviewBudgets(
  organizationId: string,
  now: Date,
): Promise<OverviewBudgets | null> {
  const year = await yearProgress({ organizationId, now });
  if (year.budgets.length === 0 && !year.carbon) return null;
  const { lastMonthToDate } = year;
  const withMoney = year.budgets.filter(
    (b): b is BudgetProgress & { money: Progress } => b.money !== null,
  );
  const out: BudgetSeries[] = [];
  for (const [currency, group] of groupBy(
    withMoney,
    (b) => b.budget.currency ?? "",
  ))
    out.push(
      series(
        `money-${currency}`,
        "Cost, all carriers",
        currency,
        combine(
          group.map((b) => b.money),
          lastMonthToDate,
          2,
        ),
      ),
    );
  for (const [carrier, group] of groupBy(year.budgets, (b) => b.budget.carrier))
    out.push(
      series(
        `kwh-${carrier}`,
        carrier,
        "kWh",
        combine(
          group.map((b) => b.energy),
          lastMonthToDate,
          3,
        ),
      ),
    );
  if (year.carbon)
    out.push(
      series("carbon", "Carbon, all carriers", "kg CO₂e", year.carbon.progress),
    );
  const target = year.carbon?.target;
  return {
    label: year.label,
    lastMonthToDate,
    series: out,
    carbonTarget:
      target && year.carbon
        ? {
            baseYearLabel: financialYearLabel(
              target.base_year,
              year.startMonth,
            ),
            reductionPercent: target.reduction_percent,
            basis: target.basis,
            baseKg: year.carbon.baseKg,
            allowedKg: year.carbon.allowedKg,
          }
        : null,
  };
}
