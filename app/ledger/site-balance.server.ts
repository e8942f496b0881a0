import { and, desc, eq, sql } from "drizzle-orm";
import { db, pool } from "~/db/client.server";
import { meterOfRollup } from "~/db/conditions.server";
import { meters, monthlyRollups } from "~/db/schema";
import {
  residualFlag,
  type BalanceMeter,
  type CarrierBoundary,
  type ParentBalance,
  type SiteBalance,
} from "./balance";

export { MONTH_PATTERN } from "~/lib/months";
import { MONTH_PATTERN } from "~/lib/months";
import { deliveredSignSql } from "./delivered";

/**
 * One site's energy balance for one site-local month, from the monthly
 * rollups (never from intervals): each meter's signed energy with its parent,
 * per parent meter the sum of its direct sub-meters and the residual
 * (parent − Σ sub-meters, the distribution loss) with its share of the
 * parent, and the boundary totals per carrier (boundary meters only: no
 * parent). Meters, parents and the site's net are the thermodynamic view
 * (into the site +); the boundary totals per carrier are delivered and
 * exported energy, as the ledger shows them (delivered.ts). The figures are
 * the rollups as they stand, corrections after a month close included. Sums
 * are PostgreSQL numeric and come back as decimal strings.
 *
 * Still raw SQL, and not yet justified by a bench (docs/architecture.md,
 * "Data access"): it is to be measured against a query-builder version.
 */
export async function siteBalance({
  organizationId,
  siteId,
  month,
}: {
  organizationId: string;
  siteId: string;
  month: string;
}): Promise<SiteBalance> {
  if (!MONTH_PATTERN.test(month)) throw new Error(`Not a month: ${month}`);
  const { rows } = await pool.query<{
    balance: Omit<SiteBalance, "parents"> & {
      parents: Omit<ParentBalance, "flag">[];
    };
  }>(
    `with site_meters as (
       select m.id, m.code, m.name, m.carrier, m.orientation, m.parent_meter_id, m.position, m.removed_at,
              r.energy_kwh, r.estimated_kwh
         from meters m
         left join monthly_rollups r
           on r.organization_id = m.organization_id and r.meter_id = m.id
          and r.month = to_date($3, 'YYYY-MM')
        where m.organization_id = $1 and m.site_id = $2
     ), present as (
       -- Meters with a rollup this month, and parents whose sub-meters have one.
       select x.id, x.code, x.name, x.carrier, x.orientation, x.parent_meter_id, x.position, x.removed_at,
              coalesce(x.energy_kwh, 0) as energy_kwh, coalesce(x.estimated_kwh, 0) as estimated_kwh
         from site_meters x
        where x.energy_kwh is not null
           or exists (select 1 from site_meters c
                       where c.parent_meter_id = x.id and c.energy_kwh is not null)
     ), parents as (
       select p.id, p.code, p.name, p.carrier, p.energy_kwh as parent_kwh,
              sum(c.energy_kwh) as children_kwh, count(*)::int as child_count
         from present p join present c on c.parent_meter_id = p.id
        group by p.id, p.code, p.name, p.carrier, p.energy_kwh
     ), boundary as (
       select carrier,
              coalesce(sum(${deliveredSignSql("carrier")} * energy_kwh) filter (where orientation = 'import'), 0) as imports_kwh,
              coalesce(sum(${deliveredSignSql("carrier")} * energy_kwh) filter (where orientation = 'export'), 0) as exports_kwh,
              sum(${deliveredSignSql("carrier")} * energy_kwh) as net_kwh,
              sum(energy_kwh) as into_site_kwh
         from present where parent_meter_id is null and position = 'boundary'
        group by carrier
     )
     select json_build_object(
       'month', $3::text,
       'meters', coalesce((select json_agg(json_build_object(
           'id', id, 'code', code, 'name', name, 'carrier', carrier, 'orientation', orientation,
           'parentMeterId', parent_meter_id, 'position', position, 'retired', removed_at is not null,
           'energyKwh', energy_kwh::text, 'estimatedKwh', estimated_kwh::text)
           order by parent_meter_id nulls first, code) from present), '[]'::json),
       'parents', coalesce((select json_agg(json_build_object(
           'meterId', id, 'code', code, 'name', name, 'carrier', carrier,
           'parentKwh', parent_kwh::text, 'childrenKwh', children_kwh::text,
           'residualKwh', (parent_kwh - children_kwh)::text,
           'residualFraction', ((parent_kwh - children_kwh) / nullif(parent_kwh, 0))::float8,
           'childCount', child_count)
           order by code) from parents), '[]'::json),
       'boundary', coalesce((select json_agg(json_build_object(
           'carrier', carrier, 'importsKwh', imports_kwh::text,
           'exportsKwh', exports_kwh::text, 'netKwh', net_kwh::text)
           order by carrier) from boundary), '[]'::json),
       'netKwh', (select coalesce(sum(into_site_kwh), 0)::text from boundary)) as balance`,
    [organizationId, siteId, month],
  );
  const balance = rows[0].balance;
  return {
    ...balance,
    meters: balance.meters as BalanceMeter[],
    boundary: balance.boundary as CarrierBoundary[],
    parents: balance.parents.map((p) => ({
      ...p,
      flag: residualFlag(p.parentKwh, p.childrenKwh),
    })),
  };
}

/** The site-local months that have rollups for the site's meters, newest first (YYYY-MM). */
export async function balanceMonths({
  organizationId,
  siteId,
}: {
  organizationId: string;
  siteId: string;
}): Promise<string[]> {
  const month = sql<string>`to_char(${monthlyRollups.month}, 'YYYY-MM')`;
  const rows = await db
    .selectDistinct({ month })
    .from(monthlyRollups)
    .innerJoin(meters, meterOfRollup)
    .where(
      and(
        eq(monthlyRollups.organizationId, organizationId),
        eq(meters.siteId, siteId),
      ),
    )
    .orderBy(desc(month));
  return rows.map((r) => r.month);
}
