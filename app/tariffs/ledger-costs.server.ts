import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import type { CostCell } from "./ledger-costs";

export interface CostCellQuery {
  organizationId: string;
  from: string;
  to: string;
  siteId?: string | null;
  carrier?: string | null;
}

/**
 * Each supply month's cost in [from, to] by site, month and carrier. A closed
 * month shows its cost as closed: the adjusting entries made since its close
 * are taken off the cost and shown beside it, as the ledger does for energy.
 */
export async function ledgerCostCells(q: CostCellQuery): Promise<CostCell[]> {
  const { rows } = await db.execute<
    CostCell & Record<string, unknown>
  >(sql`with closes as (
       select site_id, month, min(closed_at) as closed_at from month_closes
        where organization_id = ${q.organizationId} and reopened_at is null
          and month between to_date(${q.from}, 'YYYY-MM') and to_date(${q.to}, 'YYYY-MM')
        group by site_id, month
     ), cells as (
       select t.id as tariff_id, t.site_id, t.carrier, c.month, c.currency, c.cost,
              least(cs.closed_at, co.closed_at) as closed_at
         from monthly_costs c
         join tariffs t on t.organization_id = c.organization_id and t.id = c.tariff_id
         left join closes cs on cs.site_id = t.site_id and cs.month = c.month
         left join closes co on co.site_id is null and co.month = c.month
        where c.organization_id = ${q.organizationId}
          and c.month between to_date(${q.from}, 'YYYY-MM') and to_date(${q.to}, 'YYYY-MM')
          and (${q.siteId ?? null}::uuid is null or t.site_id = ${q.siteId ?? null}::uuid)
          and (${q.carrier ?? null}::text is null or t.carrier::text = ${q.carrier ?? null}::text)
     )
     select x.site_id, to_char(x.month, 'YYYY-MM') as month, x.carrier::text as carrier, x.currency,
            (x.cost - coalesce(a.delta, 0))::text as cost, coalesce(a.delta, 0)::text as adjustments_cost
       from cells x
       left join lateral (
         select sum(delta_cost) as delta from cost_adjustments a
          where a.organization_id = ${q.organizationId} and a.tariff_id = x.tariff_id
            and a.month = x.month and x.closed_at is not null and a.created_at >= x.closed_at
       ) a on true`);
  return rows;
}
