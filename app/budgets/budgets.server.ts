/**
 * Budgets per site, carrier and financial year, and the organisation's
 * carbon target: stored, read with their monthly spread, and saved with an
 * audit entry. Bad input (an unknown site) is refused with the reason and
 * nothing is stored.
 */
import { and, asc, eq } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { joinMonths, pointsIn } from "~/baselines/analysis";
import {
  monthlyDegreeDays,
  type DailyTemperature,
} from "~/baselines/degree-days";
import {
  monthlyEnergyBySiteAndCarrier,
  type SiteMonthlyEnergy,
} from "~/baselines/energy.server";
import { fitBaseline } from "~/baselines/regression";
import { dailyTemperaturesOfSites } from "~/baselines/weather.server";
import { db } from "~/db/client.server";
import { budgets, carbonTargets, sites } from "~/db/schema";
import { financialYear } from "~/financial-year/financial-year";
import { financialYearStart } from "~/financial-year/financial-year.server";
import { siteCarrierKey } from "~/sites/meter-kinds";
import type { Budget, BudgetInput, CarbonTargetInput } from "./budget-schema";
import { spreadBudget } from "./spread";

export interface Actor {
  organizationId: string;
  actorUserId: string | null;
  actorTokenId?: string | null;
}

export type BudgetOutcome =
  | { ok: true; budget: Budget }
  | { ok: false; status: 400; reason: string; field: string };

/**
 * The degree-day weights of a budget year's months. A budget is set before
 * its own weather is known, so the year before stands in: the site's
 * energy of the carrier is fitted on its degree days of the same months one
 * year earlier (OLS, app/baselines; heating degree days, cooling degree days
 * for cooling), and each month's weight is the model's kWh for it, base load
 * included; pure degree days would give summer months almost nothing of a
 * heat budget that also heats water. Without a usable fit the degree days
 * alone weigh the months, and without weather the spread is flat
 * (docs/budgets.md).
 */
function degreeDayWeights(
  row: BudgetRow,
  months: string[],
  weather: SpreadWeather,
): number[] | undefined {
  const from = yearEarlier(months[0]);
  const to = yearEarlier(months[months.length - 1]);
  const driver = row.carrier === "cooling" ? "cdd" : "hdd";
  // What fitSiteBaseline fits, from figures read once for all budgets.
  const dd = monthlyDegreeDays(
    weather.temperatures.get(row.siteId) ?? [],
    Number(row.degreeDayBaseC),
    { from, to },
  );
  const energy = (
    weather.energy.get(siteCarrierKey(row.siteId, row.carrier)) ?? []
  ).filter((e) => e.month >= from && e.month <= to);
  const points = pointsIn(joinMonths(dd, energy, driver), { from, to });
  const outcome = fitBaseline(points);
  const byMonth = new Map(dd.map((d) => [d.month, d[driver]]));
  const degreeDays = months.map((m) => byMonth.get(yearEarlier(m)) ?? 0);
  if (!outcome.ok || points.length < months.length) return degreeDays;
  const { intercept, slope } = outcome.model;
  return degreeDays.map((d) => Math.max(0, intercept + slope * d));
}

const yearEarlier = (m: string) => `${Number(m.slice(0, 4)) - 1}${m.slice(4)}`;

/** The year-earlier weather and energy that degree-day spreads are fitted on. */
interface SpreadWeather {
  temperatures: Map<string, DailyTemperature[]>;
  energy: Map<string, SiteMonthlyEnergy[]>;
}

/**
 * Read once for a list of budgets (two queries, not three per budget): the
 * daily temperatures of their sites and the energy of every site and
 * carrier over the months a year before their financial years.
 */
async function spreadWeather(
  organizationId: string,
  rows: BudgetRow[],
  startMonth: number,
): Promise<SpreadWeather> {
  const fitted = rows.filter((r) => r.spread === "degree_days");
  if (fitted.length === 0)
    return { temperatures: new Map(), energy: new Map() };
  const years = fitted.map((r) => r.financialYear);
  const from = yearEarlier(
    financialYear(Math.min(...years), startMonth).months[0],
  );
  const to = yearEarlier(
    financialYear(Math.max(...years), startMonth).months[11],
  );
  const [temperatures, energy] = await Promise.all([
    dailyTemperaturesOfSites({
      organizationId,
      siteIds: [...new Set(fitted.map((r) => r.siteId))],
      from,
      to,
    }),
    monthlyEnergyBySiteAndCarrier({ organizationId, from, to }),
  ]);
  return { temperatures, energy };
}

type BudgetRow = typeof budgets.$inferSelect & {
  siteName: string;
  degreeDayBaseC: string;
};

function withSpread(
  row: BudgetRow,
  startMonth: number,
  weather: SpreadWeather,
): Budget {
  const { months } = financialYear(row.financialYear, startMonth);
  const weights =
    row.spread === "degree_days"
      ? degreeDayWeights(row, months, weather)
      : undefined;
  const energy = spreadBudget(row.energyKwh, 12, 6, weights);
  const money =
    row.amount === null ? null : spreadBudget(row.amount, 12, 2, weights);
  return {
    id: row.id,
    site_id: row.siteId,
    site_name: row.siteName,
    carrier: row.carrier,
    financial_year: row.financialYear,
    energy_kwh: row.energyKwh,
    amount: row.amount,
    currency: row.currency,
    spread: row.spread as Budget["spread"],
    months: months.map((month, i) => ({
      month,
      energy_kwh: energy[i],
      amount: money?.[i] ?? null,
    })),
  };
}

/** The organisation's budgets (of one financial year, if given), each with its spread. */
export async function listBudgets(
  organizationId: string,
  year?: number,
): Promise<Budget[]> {
  const startMonth = await financialYearStart(organizationId);
  const rows = await db
    .select({
      ...budgetColumns,
      siteName: sites.name,
      degreeDayBaseC: sites.degreeDayBaseC,
    })
    .from(budgets)
    .innerJoin(
      sites,
      and(
        eq(sites.organizationId, budgets.organizationId),
        eq(sites.id, budgets.siteId),
      ),
    )
    .where(
      and(
        eq(budgets.organizationId, organizationId),
        year === undefined ? undefined : eq(budgets.financialYear, year),
      ),
    )
    .orderBy(asc(budgets.financialYear), asc(sites.name), asc(budgets.carrier));
  const weather = await spreadWeather(organizationId, rows, startMonth);
  return rows.map((row) => withSpread(row, startMonth, weather));
}

const budgetColumns = {
  organizationId: budgets.organizationId,
  id: budgets.id,
  siteId: budgets.siteId,
  carrier: budgets.carrier,
  financialYear: budgets.financialYear,
  energyKwh: budgets.energyKwh,
  amount: budgets.amount,
  currency: budgets.currency,
  spread: budgets.spread,
  createdAt: budgets.createdAt,
};

/** Stores or replaces the budget of a site, carrier and financial year. */
export async function saveBudget(
  actor: Actor,
  input: BudgetInput,
): Promise<BudgetOutcome> {
  const { organizationId } = actor;
  const [site] = await db
    .select({ id: sites.id })
    .from(sites)
    .where(
      and(
        eq(sites.organizationId, organizationId),
        eq(sites.id, input.site_id),
      ),
    );
  if (!site)
    return {
      ok: false,
      status: 400,
      reason: "No such site in this organisation.",
      field: "site_id",
    };
  const values = {
    energyKwh: input.energy_kwh,
    amount: input.amount,
    currency: input.currency,
    spread: input.spread,
  };
  const id = await db.transaction(async (tx) => {
    const key = and(
      eq(budgets.organizationId, organizationId),
      eq(budgets.siteId, input.site_id),
      eq(budgets.carrier, input.carrier),
      eq(budgets.financialYear, input.financial_year),
    );
    const [before] = await tx.select().from(budgets).where(key).for("update");
    const [saved] = before
      ? await tx.update(budgets).set(values).where(key).returning()
      : await tx
          .insert(budgets)
          .values({
            organizationId,
            siteId: input.site_id,
            carrier: input.carrier,
            financialYear: input.financial_year,
            ...values,
          })
          .returning();
    await recordAudit(tx, {
      organizationId,
      actorUserId: actor.actorUserId,
      actorTokenId: actor.actorTokenId ?? null,
      action: "budget.saved",
      subject: saved.id,
      siteId: input.site_id,
      before: before
        ? {
            energy_kwh: before.energyKwh,
            amount: before.amount,
            currency: before.currency,
            spread: before.spread,
          }
        : null,
      after: { ...input },
    });
    return saved.id;
  });
  const [budget] = (
    await listBudgets(organizationId, input.financial_year)
  ).filter((b) => b.id === id);
  return { ok: true, budget };
}

export interface CarbonTarget {
  base_year: number;
  target_year: number;
  reduction_percent: string;
  basis: "location" | "market";
}

export async function getCarbonTarget(
  organizationId: string,
): Promise<CarbonTarget | null> {
  const [row] = await db
    .select()
    .from(carbonTargets)
    .where(eq(carbonTargets.organizationId, organizationId));
  if (!row) return null;
  return {
    base_year: row.baseYear,
    target_year: row.targetYear,
    reduction_percent: row.reductionPercent,
    basis: row.basis as CarbonTarget["basis"],
  };
}

/** The organisation's one carbon target, stored or replaced, with an audit entry. */
export async function saveCarbonTarget(
  actor: Actor,
  input: CarbonTargetInput,
): Promise<CarbonTarget> {
  const { organizationId } = actor;
  const values = {
    baseYear: input.base_year,
    targetYear: input.target_year,
    reductionPercent: input.reduction_percent,
    basis: input.basis,
  };
  await db.transaction(async (tx) => {
    const [before] = await tx
      .select()
      .from(carbonTargets)
      .where(eq(carbonTargets.organizationId, organizationId))
      .for("update");
    const [saved] = await tx
      .insert(carbonTargets)
      .values({ organizationId, ...values })
      .onConflictDoUpdate({ target: carbonTargets.organizationId, set: values })
      .returning();
    await recordAudit(tx, {
      organizationId,
      actorUserId: actor.actorUserId,
      actorTokenId: actor.actorTokenId ?? null,
      action: "carbon_target.saved",
      subject: saved.id,
      before: before
        ? {
            base_year: before.baseYear,
            target_year: before.targetYear,
            reduction_percent: before.reductionPercent,
            basis: before.basis,
          }
        : null,
      after: { ...input },
    });
  });
  return (await getCarbonTarget(organizationId))!;
}
