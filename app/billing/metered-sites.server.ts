/**
 * What the bill counts: sites that are not archived and have at least one
 * meter that has not been removed.
 */
import { asc, count } from "drizzle-orm";
import { db, type Executor } from "~/db/client.server";
import { meters, sites } from "~/db/schema";
import { activeSitesOf, installedMetersOfSite } from "~/db/conditions.server";

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
    .innerJoin(meters, installedMetersOfSite)
    .where(activeSitesOf(organizationId))
    .groupBy(sites.organizationId, sites.id)
    .orderBy(asc(sites.name));
}

export async function countMeteredSites(
  args: { organizationId: string },
  executor: Executor = db,
): Promise<number> {
  return (await listMeteredSites(args, executor)).length;
}
