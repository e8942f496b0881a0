/**
 * What the bill counts: sites that are not archived and have at least one
 * meter that has not been removed.
 */
import { and, asc, count, eq, isNull } from "drizzle-orm";
import { db, type Executor } from "~/db/client.server";
import { meters, sites } from "~/db/schema";

export async function listMeteredSites(
  { organizationId }: { organizationId: string },
  executor: Executor = db,
) {
  return executor
    .select({
      id: sites.id,
      name: sites.name,
      activeMeters: count(meters.id),
    })
    .from(sites)
    .innerJoin(
      meters,
      and(
        eq(meters.organizationId, sites.organizationId),
        eq(meters.siteId, sites.id),
        isNull(meters.removedAt),
      ),
    )
    .where(
      and(eq(sites.organizationId, organizationId), isNull(sites.archivedAt)),
    )
    .groupBy(sites.organizationId, sites.id)
    .orderBy(asc(sites.name));
}

export async function countMeteredSites(
  args: { organizationId: string },
  executor: Executor = db,
): Promise<number> {
  return (await listMeteredSites(args, executor)).length;
}
