/**
 * The money actual of a budget: the cost the tariffs computed for a site and
 * carrier over some months (monthly_costs, app/tariffs). A supply is a meter
 * or a site and carrier; every tariff of the site and carrier counts, so a
 * site with one tariff per meter sums them. Exact: PostgreSQL numeric, text.
 */
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { siteCarrierKey } from "~/sites/meter-kinds";
import { refreshStaleCosts } from "~/tariffs/costs.server";

export interface CostQuery {
  organizationId: string;
  siteId: string;
  carrier: string;
  /** First and last month, YYYY-MM, both included. */
  from: string;
  to: string;
}

/** Each month's cost of a supply, YYYY-MM → decimal text. */
export type MonthlyCost = Map<string, string>;

/**
 * Each month's cost of every site and carrier a tariff covers, in one read
 * (a year's budgets ask for many supplies), keyed by `siteCarrierKey`. A
 * site and carrier without a tariff is absent.
 */
export async function ledgerCostsByMonth(
  query: Omit<CostQuery, "siteId" | "carrier">,
): Promise<Map<string, MonthlyCost>> {
  // The same freshness as the Ledger: months whose energy moved are priced again first.
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
      where t.organization_id = ${query.organizationId} and t.site_id is not null
      group by t.site_id, t.carrier, c.month order by c.month`);
  const costs = new Map<string, MonthlyCost>();
  for (const row of rows) {
    const key = siteCarrierKey(row.site_id, row.carrier);
    const months = costs.get(key) ?? new Map<string, string>();
    costs.set(key, months);
    if (row.month && row.cost !== null) months.set(row.month, row.cost);
  }
  return costs;
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
