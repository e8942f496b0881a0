/**
 * Actual against budget by month, and the forecast to year end. Pure and
 * exact (decimal.js-light, decimal text in and out).
 *
 * Forecast method (docs/budgets.md): the months to date keep their actual;
 * each month still to come is its budget scaled by the year-to-date ratio
 * Σ actual ÷ Σ budget of the months to date (1 when nothing is budgeted to
 * date yet). The year-end forecast is the sum of both.
 */
import Decimal from "decimal.js-light";

const Exact = Decimal.clone({ precision: 60 });

export interface MonthBudget {
  month: string;
  budget: string;
  /** Null: no figure (a month to come, or no data). */
  actual: string | null;
}

export interface MonthProgress extends MonthBudget {
  /** The actual for a month to date; budget × ratio for a month to come. */
  forecast: string;
  toDate: boolean;
}

export interface Progress {
  months: MonthProgress[];
  budget: string;
  actualToDate: string;
  budgetToDate: string;
  /** Σ actual ÷ Σ budget to date, or null when nothing was budgeted to date. */
  ratio: string | null;
  forecast: string;
}

const text = (d: InstanceType<typeof Exact>, places: number) =>
  d.toDecimalPlaces(places).toFixed(places);

/** `lastMonthToDate`: the last month (YYYY-MM) counted as actual; later months are forecast. */
export function budgetProgress(
  months: readonly MonthBudget[],
  lastMonthToDate: string,
  places: number,
): Progress {
  const toDate = (m: string) => m <= lastMonthToDate;
  let actual = new Exact(0);
  let budgetSoFar = new Exact(0);
  let budget = new Exact(0);
  for (const m of months) {
    budget = budget.plus(m.budget);
    if (!toDate(m.month)) continue;
    actual = actual.plus(m.actual ?? 0);
    budgetSoFar = budgetSoFar.plus(m.budget);
  }
  const ratio = budgetSoFar.isZero() ? null : actual.div(budgetSoFar);
  let forecast = new Exact(0);
  const rows = months.map((m): MonthProgress => {
    const past = toDate(m.month);
    const value = past
      ? new Exact(m.actual ?? 0)
      : new Exact(m.budget).times(ratio ?? 1);
    forecast = forecast.plus(value);
    return { ...m, forecast: text(value, places), toDate: past };
  });
  return {
    months: rows,
    budget: text(budget, places),
    actualToDate: text(actual, places),
    budgetToDate: text(budgetSoFar, places),
    ratio: ratio === null ? null : ratio.toDecimalPlaces(6).toFixed(),
    forecast: text(forecast, places),
  };
}

/** Adds decimal texts exactly (null counts as nothing). */
export function sumDecimals(values: readonly (string | null)[]): string {
  return values
    .reduce((s, v) => (v === null ? s : s.plus(v)), new Exact(0))
    .toFixed();
}
