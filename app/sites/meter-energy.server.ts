import { and, eq, gte, sum } from "drizzle-orm";
import { meterOfInterval } from "~/db/conditions.server";
import { db } from "~/db/client.server";
import { intervals, meters } from "~/db/schema";

/** Signed energy per meter of one site since a time, from its intervals (at any resolution: a sum). */
export async function siteEnergySince(args: {
  organizationId: string;
  siteId: string;
  since: Date;
}) {
  const rows = await db
    .select({ meterId: intervals.meterId, energyKwh: sum(intervals.energyKwh) })
    .from(intervals)
    .innerJoin(meters, meterOfInterval)
    .where(
      and(
        eq(intervals.organizationId, args.organizationId),
        eq(meters.siteId, args.siteId),
        gte(intervals.intervalStart, args.since),
      ),
    )
    .groupBy(intervals.meterId);
  return new Map(rows.map((r) => [r.meterId, Number(r.energyKwh)]));
}
