/**
 * Puts each supply month's cost on the ledger row of its site, month and
 * carrier, and sums rows into totals with exact decimals (never doubles):
 * each carrier's cost, and the cost across carriers per currency.
 */
import Decimal from "decimal.js-light";
import type { CostTotal } from "./cost-schema";

const Exact = Decimal.clone({ precision: 60 });
type Exact = InstanceType<typeof Exact>;

/** One supply's month as the ledger shows it (as closed, for a closed month). */
export interface CostCell {
  site_id: string;
  month: string;
  carrier: string;
  currency: string;
  cost: string;
  adjustments_cost: string;
}

interface RowKey {
  site_id: string;
  month: string;
  carrier: string;
}

interface Costed {
  cost: string | null;
  currency: string | null;
  adjustments_cost: string | null;
}

function text(value: Exact): string {
  return value.isZero() ? "0" : value.toFixed();
}

function keyOf(k: RowKey): string {
  return `${k.site_id}|${k.month}|${k.carrier}`;
}

/**
 * The rows with their cost, the carriers' totals with theirs, and the totals
 * per currency. A row's supplies share one currency (a tariff's currency
 * must match the others of its site and carrier).
 */
export function attachCosts<R extends RowKey, T extends { carrier: string }>(
  ledger: { rows: R[]; totals: T[] },
  cells: readonly CostCell[],
): {
  rows: (R & Costed)[];
  totals: (T & { cost: string | null; currency: string | null })[];
  cost_totals: CostTotal[];
} {
  const byRow = new Map<string, CostCell[]>();
  for (const cell of cells) {
    const key = keyOf(cell);
    byRow.set(key, [...(byRow.get(key) ?? []), cell]);
  }
  const rows = ledger.rows.map((row): R & Costed => {
    const mine = byRow.get(keyOf(row)) ?? [];
    if (mine.length === 0)
      return { ...row, cost: null, currency: null, adjustments_cost: null };
    const cost = mine.reduce((s, c) => s.plus(c.cost), new Exact(0));
    const adj = mine.reduce((s, c) => s.plus(c.adjustments_cost), new Exact(0));
    return {
      ...row,
      cost: text(cost),
      currency: mine[0].currency,
      adjustments_cost: text(adj),
    };
  });
  const perCurrency = new Map<string, Exact>();
  const perCarrier = new Map<string, { sum: Exact; currencies: Set<string> }>();
  for (const row of rows) {
    if (row.cost === null || row.currency === null) continue;
    perCurrency.set(
      row.currency,
      (perCurrency.get(row.currency) ?? new Exact(0)).plus(row.cost),
    );
    const c = perCarrier.get(row.carrier) ?? {
      sum: new Exact(0),
      currencies: new Set<string>(),
    };
    c.sum = c.sum.plus(row.cost);
    c.currencies.add(row.currency);
    perCarrier.set(row.carrier, c);
  }
  const totals = ledger.totals.map((t) => {
    const c = perCarrier.get(t.carrier);
    const single = c && c.currencies.size === 1;
    return {
      ...t,
      cost: single ? text(c.sum) : null,
      currency: single ? [...c.currencies][0] : null,
    };
  });
  const cost_totals = [...perCurrency.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([currency, sum]) => ({ currency, cost: text(sum) }));
  return { rows, totals, cost_totals };
}
