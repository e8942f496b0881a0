/**
 * A site's exergy for one month, per carrier, beside the energy the site
 * balance shows: boundary heat and cooling meters only (as the ledger sums
 * them), and only when every interval of every such meter has its exergy
 * (interval-exergy.ts); otherwise null, shown as "no data".
 */
import { and, eq, inArray, isNull, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { firstDayOf, meterOfRollup } from "~/db/conditions.server";
import { meters, monthlyExergy, monthlyRollups } from "~/db/schema";
import type { CarrierExergy } from "./carrier-exergy";

export const EXERGY_CARRIERS = ["heat", "cooling"] as const;

export type { CarrierExergy } from "./carrier-exergy";

export async function siteExergyOfMonth(args: {
  organizationId: string;
  siteId: string;
  /** YYYY-MM */
  month: string;
}): Promise<CarrierExergy[]> {
  const complete = sql<boolean>`bool_and(${monthlyRollups.hours} > 0 and ${monthlyExergy.intervals} = ${monthlyRollups.hours})`;
  const rows = await db
    .select({
      carrier: meters.carrier,
      exergyKwh: sql<string | null>`sum(${monthlyExergy.exergyKwh})::text`,
      complete,
    })
    .from(monthlyRollups)
    .innerJoin(meters, meterOfRollup)
    .leftJoin(
      monthlyExergy,
      and(
        eq(monthlyExergy.organizationId, monthlyRollups.organizationId),
        eq(monthlyExergy.meterId, monthlyRollups.meterId),
        eq(monthlyExergy.month, monthlyRollups.month),
      ),
    )
    .where(
      and(
        eq(monthlyRollups.organizationId, args.organizationId),
        eq(monthlyRollups.month, firstDayOf(args.month)),
        eq(meters.siteId, args.siteId),
        eq(meters.position, "boundary"),
        isNull(meters.parentMeterId),
        inArray(meters.carrier, [...EXERGY_CARRIERS]),
      ),
    )
    .groupBy(meters.carrier);
  return rows.map((r) => ({
    carrier: r.carrier,
    exergyKwh: r.complete ? r.exergyKwh : null,
  }));
}
