import { and, eq, gte, lt, max, sql } from "drizzle-orm";
import type { Interval } from "./interval-schema";
import { db } from "~/db/client.server";
import { intervals } from "~/db/schema";

function ofMeter(args: { organizationId: string; meterId: string }) {
  return and(
    eq(intervals.organizationId, args.organizationId),
    eq(intervals.meterId, args.meterId),
  );
}

/** One meter's hourly intervals in [from, to), oldest first. */
export async function listIntervals(args: {
  organizationId: string;
  meterId: string;
  from: Date;
  to: Date;
}): Promise<Interval[]> {
  return db
    .select({
      // The API's instant: UTC, to the second, with its Z.
      hour_start: sql<string>`to_char(${intervals.hourStart} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"')`,
      energy_kwh: intervals.energyKwh,
      quality: intervals.quality,
      flags: intervals.flags,
      estimate_method: intervals.estimateMethod,
      source_count: sql<number>`cardinality(${intervals.sourceReadingTimes})`,
    })
    .from(intervals)
    .where(
      and(
        ofMeter(args),
        gte(intervals.hourStart, args.from),
        lt(intervals.hourStart, args.to),
      ),
    )
    .orderBy(intervals.hourStart);
}

export async function latestIntervalHour(args: {
  organizationId: string;
  meterId: string;
}): Promise<Date | null> {
  const [row] = await db
    .select({ latest: max(intervals.hourStart) })
    .from(intervals)
    .where(ofMeter(args));
  return row?.latest ?? null;
}
