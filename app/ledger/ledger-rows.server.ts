import type { Ledger } from "./ledger-schema";
import type pg from "pg";
import { pool } from "~/db/client.server";
import { deliveredSignSql } from "./delivered";
import {
  factorJoinsSql,
  LOCATION_FACTOR_SQL,
  MARKET_FACTOR_SQL,
} from "~/carbon/carbon-sql.server";
import { refreshStaleCosts } from "~/tariffs/costs.server";
import { attachCosts } from "~/tariffs/ledger-costs";
import { ledgerCostCells } from "~/tariffs/ledger-costs.server";

// Raw SQL, on purpose: the Ledger's rollup aggregate, timed against a bare read by `npm run bench ledger`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

export interface LedgerQuery {
  organizationId: string;
  /** First and last month, YYYY-MM, inclusive. */
  from: string;
  to: string;
  siteId?: string | null;
  carrier?: string | null;
}

/**
 * The ledger's rows and totals are the API's wire shape (`ledger-schema.ts`):
 * energies are delivered and exported energy of the carrier (delivered.ts),
 * `imports_kwh` ≥ 0, `exports_kwh` ≤ 0, `net_kwh` their sum; chilled water is
 * cooling delivered, a positive figure.
 */
export type { CarrierTotal, Ledger, LedgerRow } from "./ledger-schema";

/**
 * Sites × months × carriers from the monthly rollups (never from intervals).
 * Sub-meters are inside the boundary, so only boundary meters are summed. A
 * closed month shows the figures as closed; what changed since is shown
 * beside them as adjusting entries. The rollups hold signed energy (into the
 * site +); each meter's is turned by its carrier's delivered sign before it
 * is summed, so a cooling import meter's negative heat flow becomes cooling
 * delivered. All sums are PostgreSQL numeric. A heat or cooling row's
 * `exergy_kwh` is the work-equivalent of its heat at each day's outdoor mean
 * (app/exergy), into the site +, or null unless every interval has it.
 */
export async function ledgerRows(
  query: LedgerQuery,
  readPool: pg.Pool = pool,
): Promise<Ledger> {
  // Cost beside energy (app/tariffs): months whose energy moved are priced again first.
  await refreshStaleCosts(query.organizationId, query.from, query.to);
  const { rows } = await readPool.query<{
    ledger: Omit<Ledger, "cost_totals">;
  }>(
    `with closes as (
       select site_id, month, min(closed_at) as closed_at
         from month_closes
        where organization_id = $1 and reopened_at is null
          and month between to_date($2, 'YYYY-MM') and to_date($3, 'YYYY-MM')
        group by site_id, month
     ), base as (
       select s.id as site_id, s.name as site_name, s.floor_area_m2, r.month, m.carrier, m.orientation,
              ${deliveredSignSql("m.carrier")} as sign,
              r.meter_id, r.energy_kwh, r.estimated_kwh, r.uncertainty_kwh,
              r.hours, me.exergy_kwh, me.intervals as exergy_intervals,
              least(cs.closed_at, co.closed_at) as closed_at,
              ${LOCATION_FACTOR_SQL} as f_location, ${MARKET_FACTOR_SQL} as f_market
         from monthly_rollups r
         join meters m on m.organization_id = r.organization_id and m.id = r.meter_id
         join sites s on s.organization_id = m.organization_id and s.id = m.site_id
         left join closes cs on cs.site_id = s.id and cs.month = r.month
         left join closes co on co.site_id is null and co.month = r.month
         -- Exergy beside energy (app/exergy): each meter's month of it.
         left join monthly_exergy me
           on me.organization_id = r.organization_id and me.meter_id = r.meter_id and me.month = r.month
         ${factorJoinsSql({ org: "r.organization_id", month: "r.month", carrier: "m.carrier", meterId: "r.meter_id" })}
        where r.organization_id = $1
          and r.month between to_date($2, 'YYYY-MM') and to_date($3, 'YYYY-MM')
          and m.parent_meter_id is null and m.position = 'boundary'
          and ($4::uuid is null or s.id = $4::uuid)
          and ($5::text is null or m.carrier::text = $5)
     ), adj as (
       select b.meter_id, b.month, sum(a.delta_kwh) as delta, count(*) as n
         from base b
         join ledger_adjustments a
           on a.organization_id = $1 and a.meter_id = b.meter_id and a.month = b.month
          and b.closed_at is not null and a.created_at >= b.closed_at
        group by b.meter_id, b.month
     ), cadj as (
       -- Carbon's adjusting entries: factor or contract changes since the close (carbon-adjustments.server.ts).
       select b.meter_id, b.month, sum(c.delta_co2e_kg) as location, sum(c.delta_co2e_market_kg) as market
         from base b
         join carbon_adjustments c
           on c.organization_id = $1 and c.meter_id = b.meter_id and c.month = b.month
          and b.closed_at is not null and c.created_at >= b.closed_at
        group by b.meter_id, b.month
     ), ledger as (
       select b.site_id, b.site_name, b.floor_area_m2, b.month, b.carrier,
              coalesce(sum(b.sign * (b.energy_kwh - coalesce(a.delta, 0))) filter (where b.orientation = 'import'), 0) as imports_kwh,
              coalesce(sum(b.sign * (b.energy_kwh - coalesce(a.delta, 0))) filter (where b.orientation = 'export'), 0) as exports_kwh,
              sum(b.sign * (b.energy_kwh - coalesce(a.delta, 0))) as net_kwh,
              sum(b.sign * b.estimated_kwh) as estimated_kwh,
              sum(b.uncertainty_kwh) as uncertainty_kwh,
              coalesce(sum(abs(b.estimated_kwh)) / nullif(sum(abs(b.energy_kwh)), 0), 0) as estimated_share,
              bool_or(b.closed_at is not null) as closed,
              min(b.closed_at) as closed_at,
              coalesce(sum(b.sign * a.delta), 0) as adjustments_kwh,
              coalesce(sum(a.n), 0) as adjustment_count,
              -- Only when every interval of every meter in the row has it:
              -- part of a month would pass for the whole.
              case when b.carrier in ('heat', 'cooling')
                    and bool_and(b.hours > 0 and b.exergy_intervals = b.hours)
                   then sum(b.exergy_kwh) end as exergy_kwh,
              -- Carbon of delivered energy only: exports are not netted off (docs/carbon.md).
              -- A closed month: its closed energy × today's factor, less the factor changes since.
              case when bool_or(b.f_location is null) then null else
                coalesce(sum(b.sign * (b.energy_kwh - coalesce(a.delta, 0)) * b.f_location) filter (where b.orientation = 'import'), 0)
                - coalesce(sum(ca.location), 0) end as co2e_kg,
              case when bool_or(b.f_market is null) filter (where b.orientation = 'import') then null
                   when bool_or(b.f_location is null) and count(*) filter (where b.orientation = 'import') = 0 then null else
                coalesce(sum(b.sign * (b.energy_kwh - coalesce(a.delta, 0)) * b.f_market) filter (where b.orientation = 'import'), 0)
                - coalesce(sum(ca.market), 0) end as co2e_market_kg,
              coalesce(sum(b.sign * coalesce(a.delta, 0) * b.f_location) filter (where b.orientation = 'import'), 0)
                + coalesce(sum(ca.location), 0) as co2e_adjustments_kg,
              coalesce(sum(b.sign * coalesce(a.delta, 0) * b.f_market) filter (where b.orientation = 'import'), 0)
                + coalesce(sum(ca.market), 0) as co2e_market_adjustments_kg
         from base b left join adj a on a.meter_id = b.meter_id and a.month = b.month
         left join cadj ca on ca.meter_id = b.meter_id and ca.month = b.month
        group by b.site_id, b.site_name, b.floor_area_m2, b.month, b.carrier
     ), totals as (
       select carrier, sum(imports_kwh) as imports_kwh, sum(exports_kwh) as exports_kwh,
              sum(net_kwh) as net_kwh, sum(co2e_kg) as co2e_kg, sum(co2e_market_kg) as co2e_market_kg
         from ledger group by carrier
     )
     select json_build_object(
       'from', $2::text, 'to', $3::text,
       'rows', coalesce(json_agg(json_build_object(
           'site_id', site_id, 'site_name', site_name, 'floor_area_m2', floor_area_m2::text,
           'month', to_char(month, 'YYYY-MM'), 'carrier', carrier,
           'imports_kwh', imports_kwh::text, 'exports_kwh', exports_kwh::text, 'net_kwh', net_kwh::text,
           'estimated_kwh', estimated_kwh::text, 'estimated_share', estimated_share::float8,
           'uncertainty_kwh', case when carrier in ('heat', 'cooling') and uncertainty_kwh > 0
                                   then uncertainty_kwh::text end,
           'status', case when closed then 'closed' else 'open' end,
           'adjustments_kwh', adjustments_kwh::text, 'adjustment_count', adjustment_count::int,
           'closed_at', closed_at, 'exergy_kwh', exergy_kwh::text,
           'co2e_kg', trim_scale(co2e_kg)::text, 'co2e_market_kg', trim_scale(co2e_market_kg)::text,
           'co2e_adjustments_kg', trim_scale(co2e_adjustments_kg)::text,
           'co2e_market_adjustments_kg', trim_scale(co2e_market_adjustments_kg)::text)
         order by site_name, month, carrier), '[]'::json),
       'totals', (select coalesce(json_agg(json_build_object(
           'carrier', carrier, 'imports_kwh', imports_kwh::text,
           'exports_kwh', exports_kwh::text, 'net_kwh', net_kwh::text,
           'co2e_kg', trim_scale(co2e_kg)::text, 'co2e_market_kg', trim_scale(co2e_market_kg)::text)
         order by carrier), '[]'::json) from totals),
       -- Carbon may be added across carriers (kWh never is): the exact sums of the rows that have it.
       'carbon_total', json_build_object(
           'co2e_kg', trim_scale(coalesce(sum(co2e_kg), 0))::text,
           'co2e_market_kg', trim_scale(coalesce(sum(co2e_market_kg), 0))::text,
           'rows_without_factor', (count(*) filter (where co2e_kg is null))::int)) as ledger
       from ledger`,
    [
      query.organizationId,
      query.from,
      query.to,
      query.siteId ?? null,
      query.carrier ?? null,
    ],
  );
  const ledger = rows[0].ledger;
  return { ...ledger, ...attachCosts(ledger, await ledgerCostCells(query)) };
}
