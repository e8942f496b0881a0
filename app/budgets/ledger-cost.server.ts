/**
 * The money actual of a budget: the cost the tariffs computed for a site and
 * carrier over some months (monthly_costs, app/tariffs). A supply is a meter
 * or a site and carrier; every tariff of the site and carrier counts, so a
 * site with one tariff per meter sums them. Exact: PostgreSQL numeric, text.
 */
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { refreshStaleCosts } from "~/tariffs/costs.server";

export interface CostQuery {
  organizationId: string;
  siteId: string;
  carrier: string;
  /** First and last month, YYYY-MM, both included. */
  from: string;
  to: string;
}

/** A supply's key in `ledgerCostsBySupply`: site and carrier. */
export const supplyKey = (siteId: string, carrier: string) =>
  `${siteId}|${carrier}`;

/**
 * Each month's cost (YYYY-MM → decimal text) of every site and carrier a
 * tariff covers, from one query and one freshness check: a page showing
 * many budgets asks once, not once per budget. Keyed by `supplyKey`; a
 * supply without a tariff is absent (not covered).
 */
export async function ledgerCostsBySupply(query: {
  organizationId: string;
  from: string;
  to: string;
}): Promise<Map<string, { covered: true; months: Map<string, string> }>> {
  await refreshStaleCosts(query.organizationId, query.from, query.to);
  const { rows } = await db.execute<{
    site_id: string;
    carrier: string;
    month: string | null;
    cost: string | null;
  }>(sql`select t.site_id, t.carrier::text as carrier,
              to_char(c.month, 'YYYY-MM') as month, sum(c.cost)::text as cost
       from tariffs t
       left join monthly_costs c
         on c.organization_id = t.organization_id and c.tariff_id = t.id
        and c.month between to_date(${query.from}, 'YYYY-MM') and to_date(${query.to}, 'YYYY-MM')
      where t.organization_id = ${query.organizationId}
      group by t.site_id, t.carrier, c.month order by c.month`);
  const supplies = new Map<
    string,
    { covered: true; months: Map<string, string> }
  >();
  for (const row of rows) {
    const key = supplyKey(row.site_id, row.carrier);
    const supply = supplies.get(key) ?? { covered: true, months: new Map() };
    if (row.month && row.cost !== null) supply.months.set(row.month, row.cost);
    supplies.set(key, supply);
  }
  return supplies;
}

/** The cost over the months, exact; null only when no tariff covers the site and carrier. */
export async function ledgerCost(query: CostQuery): Promise<string | null> {
  const { rows } = await db.execute<{ tariffs: number; cost: string | null }>(
    sql`select count(distinct t.id)::int as tariffs, coalesce(sum(c.cost), 0)::text as cost
       from tariffs t
       left join monthly_costs c
         on c.organization_id = t.organization_id and c.tariff_id = t.id
        and c.month between to_date(${query.from}, 'YYYY-MM') and to_date(${query.to}, 'YYYY-MM')
      where t.organization_id = ${query.organizationId}
        and t.site_id = ${query.siteId}::uuid and t.carrier::text = ${query.carrier}`,
  );
  return rows[0] && rows[0].tariffs > 0 ? rows[0].cost : null;
}
