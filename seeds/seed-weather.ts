/**
 * The synthetic daily mean temperature of the Larchmere estate, stored for
 * every Larchmere site (source "seed") on the days a site does not have yet,
 * so degree days and baselines work in the demo.
 */
import { and, eq, inArray } from "drizzle-orm";
import { insertSeedWeather } from "../app/baselines/weather.server";
import { db } from "../app/db/client.server";
import { organizations, sites } from "../app/db/schema";
import {
  ORGANIZATION_NAME,
  SCENARIO_PERIOD,
  SITES,
} from "./scenario/larchmere-estate";
import { dailyWeather } from "./scenario/weather";

/** Returns the number of days stored, over all sites. */
export async function seedWeather(organizationId?: string): Promise<number> {
  const orgId =
    organizationId ??
    (
      await db
        .select({ id: organizations.id })
        .from(organizations)
        .where(eq(organizations.name, ORGANIZATION_NAME))
    )[0]?.id;
  if (!orgId) throw new Error("seed the demo organisations first");
  const rows = dailyWeather(SCENARIO_PERIOD).map((d) => ({
    day: d.date,
    meanTempC: d.meanTempC,
  }));
  const estate = await db
    .select({ id: sites.id })
    .from(sites)
    .where(
      and(
        eq(sites.organizationId, orgId),
        inArray(
          sites.name,
          SITES.map((s) => s.name),
        ),
      ),
    );
  let stored = 0;
  for (const site of estate)
    stored += await insertSeedWeather({
      organizationId: orgId,
      siteId: site.id,
      rows,
    });
  return stored;
}
