/**
 * A site's monthly energy of one carrier for baselines, from the monthly
 * rollups of the meters on its boundary (parent_meter_id is null: sub-meters
 * are inside the boundary and already counted by their parent). Savings are
 * reckoned on the energy delivered, as the ledger shows it (chilled water is
 * cooling delivered, positive: ~/ledger/delivered.ts); export meters are
 * listed apart and never offset the consumption.
 */
import { pool } from "~/db/client.server";
import { deliveredSignSql } from "~/ledger/delivered";
import type { Carrier } from "~/sites/meter-kinds";
import type { MonthlyEnergy } from "./analysis";

export interface SiteMonthlyEnergy extends MonthlyEnergy {
  /** Delivered energy, as the ledger shows it, kWh (≥ 0). */
  importsKwh: number;
  /** Exported energy, as the ledger shows it, kWh (zero or negative). */
  exportsKwh: number;
}

export async function siteMonthlyEnergy(args: {
  organizationId: string;
  siteId: string;
  carrier: Carrier;
  /** YYYY-MM, inclusive. */
  from: string;
  to: string;
}): Promise<SiteMonthlyEnergy[]> {
  const { rows } = await pool.query<{
    month: string;
    imports_kwh: string;
    exports_kwh: string;
    estimated_kwh: string;
    import_meters: number;
  }>(
    `select to_char(r.month, 'YYYY-MM') as month,
            coalesce(sum(${deliveredSignSql("m.carrier")} * r.energy_kwh) filter (where m.orientation = 'import'), 0)::text as imports_kwh,
            coalesce(sum(${deliveredSignSql("m.carrier")} * r.energy_kwh) filter (where m.orientation = 'export'), 0)::text as exports_kwh,
            coalesce(sum(${deliveredSignSql("m.carrier")} * r.estimated_kwh) filter (where m.orientation = 'import'), 0)::text as estimated_kwh,
            count(*) filter (where m.orientation = 'import')::int as import_meters
       from monthly_rollups r
       join meters m on m.organization_id = r.organization_id and m.id = r.meter_id
      where r.organization_id = $1
        and m.site_id = $2
        and m.carrier = $3::energy_carrier
        and m.parent_meter_id is null
        and r.month between to_date($4, 'YYYY-MM') and to_date($5, 'YYYY-MM')
      group by r.month
      order by r.month`,
    [args.organizationId, args.siteId, args.carrier, args.from, args.to],
  );
  return rows
    .filter((r) => r.import_meters > 0)
    .map((r) => ({
      month: r.month,
      kwh: Number(r.imports_kwh),
      estimatedKwh: Number(r.estimated_kwh),
      importsKwh: Number(r.imports_kwh),
      exportsKwh: Number(r.exports_kwh),
    }));
}

/** The carriers a site's boundary import meters measure, and their months. */
export async function siteCarriers(args: {
  organizationId: string;
  siteId: string;
}): Promise<{ carrier: Carrier; first: string | null; last: string | null }[]> {
  const { rows } = await pool.query<{
    carrier: Carrier;
    first: string | null;
    last: string | null;
  }>(
    `select m.carrier::text as carrier,
            to_char(min(r.month), 'YYYY-MM') as first, to_char(max(r.month), 'YYYY-MM') as last
       from meters m
       left join monthly_rollups r on r.organization_id = m.organization_id and r.meter_id = m.id
      where m.organization_id = $1 and m.site_id = $2
        and m.parent_meter_id is null and m.orientation = 'import'
      group by m.carrier
      order by m.carrier`,
    [args.organizationId, args.siteId],
  );
  return rows;
}
