/**
 * The conditions queries keep writing: how the tenant tables join (always on
 * organization_id as well, which the keys start with) and the few filters
 * many modules share. One place, so that no join forgets the organisation.
 */
import { and, eq, isNull, sql } from "drizzle-orm";
import { deliveredSignSql } from "~/ledger/delivered";
import { intervals, meters, monthlyRollups, sites } from "./schema";

/** Join condition: a meter's site. */
export const siteOfMeter = and(
  eq(sites.organizationId, meters.organizationId),
  eq(sites.id, meters.siteId),
);

/** Join condition: an interval's meter. */
export const meterOfInterval = and(
  eq(meters.organizationId, intervals.organizationId),
  eq(meters.id, intervals.meterId),
);

/** Join condition: the meters still installed on a site. */
export const installedMetersOfSite = and(
  eq(meters.organizationId, sites.organizationId),
  eq(meters.siteId, sites.id),
  isNull(meters.removedAt),
);

/** One meter of an organisation. */
export function meterKey(organizationId: string, meterId: string) {
  return and(eq(meters.organizationId, organizationId), eq(meters.id, meterId));
}

/** An organisation's sites in use (not archived). */
export function activeSitesOf(organizationId: string) {
  return and(
    eq(sites.organizationId, organizationId),
    isNull(sites.archivedAt),
  );
}

/**
 * delivered.ts's sign for the carrier of the `meters` table (not an alias of
 * it) in a query-builder select, so that `sum(sign * energy)` turns the
 * thermodynamic rollups into delivered and exported energy.
 */
export const deliveredSignOfMeter = sql.raw(
  deliveredSignSql(`"meters"."carrier"`),
);

/** Join condition: a monthly rollup's meter. */
export const meterOfRollup = and(
  eq(meters.organizationId, monthlyRollups.organizationId),
  eq(meters.id, monthlyRollups.meterId),
);

/** A `YYYY-MM` month as the date of its first day, as rollups key it. */
export function firstDayOf(month: string) {
  return sql`to_date(${month}, 'YYYY-MM')`;
}
