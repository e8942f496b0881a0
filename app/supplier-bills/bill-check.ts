/**
 * The check of one bill: its period as whole site-local months, and its kWh
 * and amount against the metered kWh and the computed cost of the same
 * supply and months, within the organisation's tolerance. Pure and exact
 * (decimal.js-light); the data comes from bills.server.ts.
 */
import Decimal from "decimal.js-light";
import type { BillState } from "./bill-schema";

const Exact = Decimal.clone({
  precision: 60,
  rounding: Decimal.ROUND_HALF_EVEN,
});
type Exact = InstanceType<typeof Exact>;

export interface Tolerance {
  /** Percent of the metered kWh / computed cost; null: none. */
  percent: string | null;
  absoluteKwh: string | null;
  absoluteAmount: string | null;
}

/** With no tolerance set, a bill may differ by 2 % before it is queried. */
export const DEFAULT_TOLERANCE: Tolerance = {
  percent: "2",
  absoluteKwh: null,
  absoluteAmount: null,
};

/**
 * The months (YYYY-MM) a bill covers. Only whole months are accepted: the
 * cost is computed per site-local month, and prorating a month's standing
 * and demand charges by days would check the bill against a figure the
 * tariff never produced (docs/costs.md).
 */
export function billMonths(
  periodFrom: string,
  periodTo: string,
): { ok: true; months: string[] } | { ok: false; reason: string } {
  if (periodFrom > periodTo)
    return { ok: false, reason: "period_from is after period_to" };
  if (!periodFrom.endsWith("-01"))
    return {
      ok: false,
      reason: `period_from ${periodFrom} is not the first day of a month: bills are checked by whole months`,
    };
  const [y, m, d] = periodTo.split("-").map(Number);
  const lastDay = new Date(Date.UTC(y, m, 0)).getUTCDate();
  if (d !== lastDay)
    return {
      ok: false,
      reason: `period_to ${periodTo} is not the last day of a month: bills are checked by whole months`,
    };
  const months: string[] = [];
  let [year, month] = periodFrom.split("-").map(Number);
  const end = periodTo.slice(0, 7);
  for (;;) {
    const key = `${year}-${String(month).padStart(2, "0")}`;
    months.push(key);
    if (key >= end) break;
    month += 1;
    if (month > 12) {
      month = 1;
      year += 1;
    }
  }
  return { ok: true, months };
}

/** The allowed difference from `reference`: the larger of its percentage and the absolute figure. */
function allowed(
  reference: Exact,
  percent: string | null,
  absolute: string | null,
): Exact {
  const byPercent =
    percent === null
      ? new Exact(0)
      : reference.abs().times(percent).dividedBy(100);
  const byAbsolute = absolute === null ? new Exact(0) : new Exact(absolute);
  return byPercent.greaterThan(byAbsolute) ? byPercent : byAbsolute;
}

export interface BillComparison {
  state: Extract<BillState, "agreed" | "queried">;
  kwhDifference: string;
  amountDifference: string;
  /** Why the bill is queried, in plain words; empty when agreed. */
  reasons: string[];
}

export function compareBill(input: {
  kwh: string;
  amount: string;
  meteredKwh: string;
  computedCost: string;
  tolerance: Tolerance;
}): BillComparison {
  const { tolerance } = input;
  const kwhDifference = new Exact(input.kwh).minus(input.meteredKwh);
  const amountDifference = new Exact(input.amount).minus(input.computedCost);
  const reasons: string[] = [];
  const kwhAllowed = allowed(
    new Exact(input.meteredKwh),
    tolerance.percent,
    tolerance.absoluteKwh,
  );
  if (kwhDifference.abs().greaterThan(kwhAllowed))
    reasons.push(
      `kWh differ from the meters by ${kwhDifference.toFixed()} (allowed ${kwhAllowed.toFixed()})`,
    );
  const amountAllowed = allowed(
    new Exact(input.computedCost),
    tolerance.percent,
    tolerance.absoluteAmount,
  );
  if (amountDifference.abs().greaterThan(amountAllowed))
    reasons.push(
      `amount differs from the tariff's cost by ${amountDifference.toFixed()} (allowed ${amountAllowed.toFixed()})`,
    );
  return {
    state: reasons.length === 0 ? "agreed" : "queried",
    kwhDifference: kwhDifference.toFixed(),
    amountDifference: amountDifference.toFixed(),
    reasons,
  };
}
