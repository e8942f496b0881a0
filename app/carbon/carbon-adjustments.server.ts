/**
 * A change to a factor set or a contract after a month is closed: the closed
 * month keeps the carbon it was closed with, and the difference becomes an
 * adjusting entry (carbon_adjustments), shown beside it in the Ledger.
 *
 * Before the change, the carbon of every closed month's delivered energy is
 * read (its energy as closed: the rollup less the energy adjusting entries
 * since the close, times the factors then in force); after it, again; each
 * meter-month whose figure moved gets an entry of the difference, in the
 * caller's transaction. The Ledger then shows, for a closed month,
 * (closed energy × today's factor) − Σ entries since the close = the closed
 * figure, exactly.
 *
 * SQL through Drizzle's `execute` (parameters bound): the same joins as the
 * Ledger's aggregate (carbon-sql.server.ts), which is raw SQL too.
 */
import Decimal from "decimal.js-light";
import { sql } from "drizzle-orm";
import type { Transaction } from "~/db/client.server";
import { carbonAdjustments } from "~/db/schema";
import { deliveredSignSql } from "~/ledger/delivered";
import {
  factorJoinsSql,
  LOCATION_FACTOR_SQL,
  MARKET_FACTOR_SQL,
} from "./carbon-sql.server";

const Exact = Decimal.clone({ precision: 80 });

type ClosedCarbon = {
  meter_id: string;
  month: string;
  co2e_kg: string | null;
  co2e_market_kg: string | null;
};

export type CarbonSnapshot = Map<string, ClosedCarbon>;

/** The carbon of each closed month's delivered energy, per boundary import meter. */
export async function closedCarbon(
  tx: Transaction,
  organizationId: string,
): Promise<CarbonSnapshot> {
  const sign = sql.raw(deliveredSignSql("m.carrier"));
  const factors = sql.raw(
    factorJoinsSql({
      org: "b.organization_id",
      month: "b.month",
      carrier: "b.carrier",
      meterId: "b.meter_id",
    }),
  );
  const location = sql.raw(LOCATION_FACTOR_SQL);
  const market = sql.raw(MARKET_FACTOR_SQL);
  const result = await tx.execute<ClosedCarbon>(sql`
    with closes as (
       select site_id, month, min(closed_at) as closed_at
         from month_closes
        where organization_id = ${organizationId} and reopened_at is null
        group by site_id, month
     ), base as (
       select r.organization_id, r.meter_id, r.month, m.carrier, ${sign} as sign, r.energy_kwh,
              least(cs.closed_at, co.closed_at) as closed_at
         from monthly_rollups r
         join meters m on m.organization_id = r.organization_id and m.id = r.meter_id
         left join closes cs on cs.site_id = m.site_id and cs.month = r.month
         left join closes co on co.site_id is null and co.month = r.month
        where r.organization_id = ${organizationId}
          and m.parent_meter_id is null and m.position = 'boundary' and m.orientation = 'import'
          and (cs.closed_at is not null or co.closed_at is not null)
     )
     select b.meter_id, to_char(b.month, 'YYYY-MM-DD') as month,
            (b.sign * (b.energy_kwh - coalesce(a.delta, 0)) * ${location})::text as co2e_kg,
            (b.sign * (b.energy_kwh - coalesce(a.delta, 0)) * ${market})::text as co2e_market_kg
       from base b
       left join lateral (
         select sum(la.delta_kwh) as delta from ledger_adjustments la
          where la.organization_id = b.organization_id and la.meter_id = b.meter_id
            and la.month = b.month and la.created_at >= b.closed_at) a on true
       ${factors}`);
  return new Map(result.rows.map((r) => [`${r.meter_id}:${r.month}`, r]));
}

const minus = (after: string | null, before: string | null) =>
  new Exact(after ?? 0).minus(before ?? 0);

/**
 * Records an adjusting entry for each closed meter-month whose carbon moved
 * between two snapshots; returns how many were written.
 */
export async function recordCarbonAdjustments(
  tx: Transaction,
  organizationId: string,
  before: CarbonSnapshot,
  after: CarbonSnapshot,
  reason: string,
): Promise<number> {
  const entries = [...after.values()].flatMap((now) => {
    const then = before.get(`${now.meter_id}:${now.month}`);
    const location = minus(now.co2e_kg, then?.co2e_kg ?? null);
    const market = minus(now.co2e_market_kg, then?.co2e_market_kg ?? null);
    if (location.isZero() && market.isZero()) return [];
    return [
      {
        organizationId,
        meterId: now.meter_id,
        month: now.month,
        deltaCo2eKg: location.toFixed(),
        deltaCo2eMarketKg: market.toFixed(),
        reason,
      },
    ];
  });
  if (entries.length) await tx.insert(carbonAdjustments).values(entries);
  return entries.length;
}

/** Runs `change` and records what it did to closed months, in one transaction. */
export async function withCarbonAdjustments<T>(
  tx: Transaction,
  organizationId: string,
  reason: string,
  change: () => Promise<T>,
): Promise<{ result: T; adjusted: number }> {
  const before = await closedCarbon(tx, organizationId);
  const result = await change();
  const after = await closedCarbon(tx, organizationId);
  const adjusted = await recordCarbonAdjustments(
    tx,
    organizationId,
    before,
    after,
    reason,
  );
  return { result, adjusted };
}
