/**
 * A site's monthly energy of one carrier for baselines, from the monthly
 * rollups of the meters on its boundary (parent_meter_id is null: sub-meters
 * are inside the boundary and already counted by their parent). Savings are
 * reckoned on the energy delivered, as the ledger shows it (chilled water is
 * cooling delivered, positive: ~/ledger/delivered.ts); export meters are
 * listed apart and never offset the consumption.
 */
import { and, between, eq, isNull, sql } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";
import { db } from "~/db/client.server";
import {
  deliveredSignOfMeter,
  firstDayOf,
  meterOfRollup,
} from "~/db/conditions.server";
import { meters, monthlyRollups } from "~/db/schema";
import { siteCarrierKey, type Carrier } from "~/sites/meter-kinds";
import type { MonthlyEnergy } from "./analysis";

export interface SiteMonthlyEnergy extends MonthlyEnergy {
  /** Delivered energy, as the ledger shows it, kWh (≥ 0). */
  importsKwh: number;
  /** Exported energy, as the ledger shows it, kWh (zero or negative). */
  exportsKwh: number;
}

// Delivered energy of the boundary meters' rollups, one row a month (and a
// site and carrier when grouped so): the sums both reads below share.
const delivered = (kwh: AnyPgColumn) => sql`${deliveredSignOfMeter} * ${kwh}`;
const monthlySums = {
  month: sql<string>`to_char(${monthlyRollups.month}, 'YYYY-MM')`,
  imports_kwh: sql<string>`coalesce(sum(${delivered(monthlyRollups.energyKwh)}) filter (where ${meters.orientation} = 'import'), 0)::text`,
  exports_kwh: sql<string>`coalesce(sum(${delivered(monthlyRollups.energyKwh)}) filter (where ${meters.orientation} = 'export'), 0)::text`,
  estimated_kwh: sql<string>`coalesce(sum(${delivered(monthlyRollups.estimatedKwh)}) filter (where ${meters.orientation} = 'import'), 0)::text`,
  import_meters: sql<number>`count(*) filter (where ${meters.orientation} = 'import')::int`,
};

function boundaryMonths(organizationId: string, from: string, to: string) {
  return and(
    eq(monthlyRollups.organizationId, organizationId),
    isNull(meters.parentMeterId),
    eq(meters.position, "boundary"),
    between(monthlyRollups.month, firstDayOf(from), firstDayOf(to)),
  );
}

function monthlyEnergyOf(r: {
  month: string;
  imports_kwh: string;
  exports_kwh: string;
  estimated_kwh: string;
}): SiteMonthlyEnergy {
  return {
    month: r.month,
    kwh: Number(r.imports_kwh),
    estimatedKwh: Number(r.estimated_kwh),
    importsKwh: Number(r.imports_kwh),
    exportsKwh: Number(r.exports_kwh),
  };
}

export async function siteMonthlyEnergy(args: {
  organizationId: string;
  siteId: string;
  carrier: Carrier;
  /** YYYY-MM, inclusive. */
  from: string;
  to: string;
}): Promise<SiteMonthlyEnergy[]> {
  const rows = await db
    .select(monthlySums)
    .from(monthlyRollups)
    .innerJoin(meters, meterOfRollup)
    .where(
      and(
        boundaryMonths(args.organizationId, args.from, args.to),
        eq(meters.siteId, args.siteId),
        eq(meters.carrier, args.carrier),
      ),
    )
    .groupBy(monthlyRollups.month)
    .orderBy(monthlyRollups.month);
  return rows.filter((r) => r.import_meters > 0).map(monthlyEnergyOf);
}

/**
 * `siteMonthlyEnergy` of every site and carrier of the organisation from one
 * query (the same sums, grouped by site and carrier as well): for pages that
 * need many sites' figures at once.
 */
export async function monthlyEnergyBySiteAndCarrier(args: {
  organizationId: string;
  /** YYYY-MM, inclusive. */
  from: string;
  to: string;
}): Promise<Map<string, SiteMonthlyEnergy[]>> {
  const rows = await db
    .select({
      site_id: meters.siteId,
      carrier: sql<string>`${meters.carrier}::text`,
      ...monthlySums,
    })
    .from(monthlyRollups)
    .innerJoin(meters, meterOfRollup)
    .where(boundaryMonths(args.organizationId, args.from, args.to))
    .groupBy(meters.siteId, meters.carrier, monthlyRollups.month)
    .orderBy(monthlyRollups.month);
  const bySupply = new Map<string, SiteMonthlyEnergy[]>();
  for (const r of rows) {
    if (r.import_meters === 0) continue;
    const key = siteCarrierKey(r.site_id, r.carrier);
    const months = bySupply.get(key) ?? [];
    months.push(monthlyEnergyOf(r));
    bySupply.set(key, months);
  }
  return bySupply;
}

/** The carriers a site's boundary import meters measure, and their months. */
export async function siteCarriers(args: {
  organizationId: string;
  siteId: string;
}): Promise<{ carrier: Carrier; first: string | null; last: string | null }[]> {
  const rows = await db
    .select({
      carrier: sql<Carrier>`${meters.carrier}::text`,
      first: sql<
        string | null
      >`to_char(min(${monthlyRollups.month}), 'YYYY-MM')`,
      last: sql<
        string | null
      >`to_char(max(${monthlyRollups.month}), 'YYYY-MM')`,
    })
    .from(meters)
    .leftJoin(monthlyRollups, meterOfRollup)
    .where(
      and(
        eq(meters.organizationId, args.organizationId),
        eq(meters.siteId, args.siteId),
        isNull(meters.parentMeterId),
        eq(meters.position, "boundary"),
        eq(meters.orientation, "import"),
      ),
    )
    .groupBy(meters.carrier)
    .orderBy(meters.carrier);
  return rows;
}
