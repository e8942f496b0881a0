/**
 * The demo's illustrative budgets and carbon target (Larchmere Borough
 * Estates, invented): for the financial year 2026/27, each site and carrier
 * gets a budget 3 % below what it used and cost in 2025/26, spread by degree
 * days for heat and fuels and flat for electricity; the carbon target is
 * 10 % below FY 2025/26 (the first whole financial year of the demo's data),
 * location-based. Put in through the same code as the API, only when the
 * organisation has none yet.
 */
import Decimal from "decimal.js-light";
import { eq } from "drizzle-orm";
import { db } from "../app/db/client.server";
import { budgets, users } from "../app/db/schema";
import {
  getCarbonTarget,
  saveBudget,
  saveCarbonTarget,
} from "../app/budgets/budgets.server";
import { financialYear } from "../app/financial-year/financial-year";
import { financialYearStart } from "../app/financial-year/financial-year.server";
import { ledgerRows } from "../app/ledger/ledger-rows.server";

const BASE_YEAR = 2025;
const BUDGET_YEAR = 2026;
const BUDGET_SHARE = "0.97";

export async function seedBudgets(organizationId: string): Promise<void> {
  const [existing] = await db
    .select({ id: budgets.id })
    .from(budgets)
    .where(eq(budgets.organizationId, organizationId))
    .limit(1);
  const [manager] = await db
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, "manager@larchmere.example"));
  const actor = { organizationId, actorUserId: manager?.id ?? null };
  if (!existing) {
    const span = financialYear(
      BASE_YEAR,
      await financialYearStart(organizationId),
    );
    const ledger = await ledgerRows({
      organizationId,
      from: span.from,
      to: span.to,
    });
    const lastYear = new Map<string, { kwh: Decimal; cost: Decimal | null }>();
    for (const r of ledger.rows) {
      const key = `${r.site_id}|${r.carrier}`;
      const sum = lastYear.get(key) ?? {
        kwh: new Decimal(0),
        cost: new Decimal(0),
      };
      sum.kwh = sum.kwh.plus(r.imports_kwh);
      sum.cost =
        r.cost === null || sum.cost === null ? null : sum.cost.plus(r.cost);
      lastYear.set(key, sum);
    }
    for (const [key, sum] of lastYear) {
      if (sum.kwh.lte(0)) continue;
      const [siteId, carrier] = key.split("|");
      const saved = await saveBudget(actor, {
        site_id: siteId,
        carrier: carrier as never,
        financial_year: BUDGET_YEAR,
        energy_kwh: sum.kwh.times(BUDGET_SHARE).toDecimalPlaces(0).toFixed(0),
        amount:
          sum.cost === null
            ? null
            : sum.cost.times(BUDGET_SHARE).toDecimalPlaces(2).toFixed(2),
        currency: sum.cost === null ? null : "GBP",
        spread: carrier === "electricity" ? "flat" : "degree_days",
      });
      if (!saved.ok) throw new Error(`demo budget ${key}: ${saved.reason}`);
    }
  }
  if (!(await getCarbonTarget(organizationId)))
    await saveCarbonTarget(actor, {
      base_year: BASE_YEAR,
      target_year: BUDGET_YEAR,
      reduction_percent: "10",
      basis: "location",
    });
}
