/**
 * A financial year's budgets against the ledger: each budget's months with
 * the actual energy (the ledger's delivered kWh, `imports_kwh`, of the site
 * and carrier) and the actual cost (the tariffs' monthly cost, ledgerCost),
 * the forecast to year end, and the carbon target's progress. Months up to
 * the last complete month count as actual; the rest are forecast
 * (progress.ts says how).
 */
import Decimal from "decimal.js-light";
import { financialYear } from "~/financial-year/financial-year";
import { financialYearStart } from "~/financial-year/financial-year.server";
import { ledgerRows } from "~/ledger/ledger-rows.server";
import { monthKey } from "~/lib/months";
import {
  getCarbonTarget,
  listBudgets,
  type CarbonTarget,
} from "./budgets.server";
import { siteCarrierKey } from "~/sites/meter-kinds";
import { ledgerCostsByMonth, type MonthlyCost } from "./ledger-cost.server";
import { budgetProgress, sumDecimals, type Progress } from "./progress";
import type { Budget } from "./budget-schema";

const Exact = Decimal.clone({ precision: 60 });

export interface BudgetProgress {
  budget: Budget;
  energy: Progress;
  /** Null: no money budget, or no tariff prices the supply. */
  money: Progress | null;
}

export interface CarbonProgress {
  target: CarbonTarget;
  /** The base year's carbon, kg CO₂e, all carriers. */
  baseKg: string;
  /** The year's allowance: base × (1 − reduction). */
  allowedKg: string;
  /** Monthly path: the base year's same month × (1 − reduction). */
  progress: Progress;
}

export interface YearProgress {
  year: number;
  label: string;
  months: string[];
  lastMonthToDate: string;
  /** The month (1–12) the organisation's financial year starts in. */
  startMonth: number;
  budgets: BudgetProgress[];
  carbon: CarbonProgress | null;
}

/** The month before `now`'s: the last complete month. */
function lastCompleteMonth(now: Date): string {
  return monthKey(
    new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1)),
  );
}

/** The year's ledger rows summed by a key, exactly. */
function sumBy<R>(
  rows: R[],
  key: (r: R) => string,
  value: (r: R) => string | null,
) {
  const groups = new Map<string, (string | null)[]>();
  for (const r of rows)
    groups.set(key(r), [...(groups.get(key(r)) ?? []), value(r)]);
  return new Map([...groups].map(([k, v]) => [k, sumDecimals(v)]));
}

export async function yearProgress(args: {
  organizationId: string;
  /** The financial year; the current one when left out. */
  year?: number;
  now?: Date;
  /** The organisation's financial year start, when the caller has read it. */
  startMonth?: number;
}): Promise<YearProgress> {
  const now = args.now ?? new Date();
  const startMonth =
    args.startMonth ?? (await financialYearStart(args.organizationId));
  const lastMonthToDate = lastCompleteMonth(now);
  const current = monthKey(now);
  const year =
    args.year ??
    (Number(current.slice(5)) >= startMonth
      ? Number(current.slice(0, 4))
      : Number(current.slice(0, 4)) - 1);
  const span = financialYear(year, startMonth);
  const [budgets, ledger, target] = await Promise.all([
    listBudgets(args.organizationId, year),
    ledgerRows({
      organizationId: args.organizationId,
      from: span.from,
      to: span.to,
    }),
    getCarbonTarget(args.organizationId),
  ]);
  const energyByMonth = sumBy(
    ledger.rows,
    (r) => `${r.site_id}|${r.carrier}|${r.month}`,
    (r) => r.imports_kwh,
  );
  // Every supply's cost in one read, after the ledger has priced stale
  // months; the carbon target's base year beside it.
  const [costs, carbon] = await Promise.all([
    budgets.some((b) => b.amount !== null)
      ? ledgerCostsByMonth({
          organizationId: args.organizationId,
          from: span.from,
          to: span.to,
        })
      : new Map<string, MonthlyCost>(),
    target
      ? carbonProgress(
          args.organizationId,
          target,
          span.months,
          ledger.rows,
          // The base year is often this year: its ledger is read already.
          target.base_year === year ? ledger.rows : null,
          startMonth,
          lastMonthToDate,
        )
      : null,
  ]);
  const progress = budgets.map((budget): BudgetProgress => {
    const key = (m: string) => `${budget.site_id}|${budget.carrier}|${m}`;
    const energy = budgetProgress(
      budget.months.map((m) => ({
        month: m.month,
        budget: m.energy_kwh,
        actual: energyByMonth.get(key(m.month)) ?? null,
      })),
      lastMonthToDate,
      3,
    );
    if (budget.amount === null) return { budget, energy, money: null };
    // No tariff covers the supply: no money actual.
    const cost = costs.get(siteCarrierKey(budget.site_id, budget.carrier));
    const money = cost
      ? budgetProgress(
          budget.months.map((m) => ({
            month: m.month,
            budget: m.amount ?? "0",
            actual: cost.get(m.month) ?? null,
          })),
          lastMonthToDate,
          2,
        )
      : null;
    return { budget, energy, money };
  });
  return {
    year,
    label: span.label,
    months: span.months,
    lastMonthToDate,
    startMonth,
    budgets: progress,
    carbon,
  };
}

type Row = Awaited<ReturnType<typeof ledgerRows>>["rows"][number];

const carbonOf = (basis: CarbonTarget["basis"]) => (r: Row) =>
  basis === "market" ? r.co2e_market_kg : r.co2e_kg;

/**
 * The target's path through the year: each month's allowance is the base
 * year's same month less the reduction, so a cold month is allowed more.
 */
async function carbonProgress(
  organizationId: string,
  target: CarbonTarget,
  months: string[],
  rows: Row[],
  baseRows: Row[] | null,
  startMonth: number,
  lastMonthToDate: string,
): Promise<CarbonProgress> {
  const base = financialYear(target.base_year, startMonth);
  const baseLedger =
    baseRows ??
    (
      await ledgerRows({
        organizationId,
        from: base.from,
        to: base.to,
      })
    ).rows;
  const baseByIndex = sumBy(
    baseLedger,
    (r) => String(base.months.indexOf(r.month)),
    carbonOf(target.basis),
  );
  const actualByMonth = sumBy(rows, (r) => r.month, carbonOf(target.basis));
  const allowance = (kg: string) => exactTimes(kg, target.reduction_percent);
  const progress = budgetProgress(
    months.map((month, i) => ({
      month,
      budget: allowance(baseByIndex.get(String(i)) ?? "0"),
      actual: actualByMonth.get(month) ?? null,
    })),
    lastMonthToDate,
    3,
  );
  const baseKg = sumDecimals([...baseByIndex.values()]);
  return {
    target,
    baseKg,
    allowedKg: exactTimes(baseKg, target.reduction_percent),
    progress,
  };
}

/** kg × (1 − percent/100), exact. */
function exactTimes(kg: string, percent: string): string {
  return new Exact(kg).times(new Exact(100).minus(percent)).div(100).toFixed();
}
