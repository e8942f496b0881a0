import { and, eq, gte, lt, max, sql } from "drizzle-orm";
import type { Interval } from "./interval-schema";
import { db, type Database } from "~/db/client.server";
import { intervals, meters } from "~/db/schema";

function ofMeter(args: { organizationId: string; meterId: string }) {
  return and(
    eq(intervals.organizationId, args.organizationId),
    eq(intervals.meterId, args.meterId),
  );
}

// The API's instant: UTC, to the second, with its Z.
const isoUtc = (instant: ReturnType<typeof sql>) =>
  sql<string>`to_char((${instant}) at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"')`;

/**
 * One meter's intervals in [from, to) at its own resolution, oldest first;
 * each ends its meter's interval_minutes after it starts.
 */
export async function listIntervals(
  args: {
    organizationId: string;
    meterId: string;
    from: Date;
    to: Date;
  },
  readDb: Database = db,
): Promise<Interval[]> {
  return readDb
    .select({
      start: isoUtc(sql`${intervals.intervalStart}`),
      end: isoUtc(
        sql`${intervals.intervalStart} + ${meters.intervalMinutes} * interval '1 minute'`,
      ),
      energy_kwh: intervals.energyKwh,
      quality: intervals.quality,
      flags: intervals.flags,
      estimate_method: intervals.estimateMethod,
      source_count: sql<number>`cardinality(${intervals.sourceReadingTimes})`,
    })
    .from(intervals)
    .innerJoin(
      meters,
      and(
        eq(meters.organizationId, intervals.organizationId),
        eq(meters.id, intervals.meterId),
      ),
    )
    .where(
      and(
        ofMeter(args),
        gte(intervals.intervalStart, args.from),
        lt(intervals.intervalStart, args.to),
      ),
    )
    .orderBy(intervals.intervalStart);
}

export async function latestIntervalHour(
  args: {
    organizationId: string;
    meterId: string;
  },
  readDb: Database = db,
): Promise<Date | null> {
  const [row] = await readDb
    .select({ latest: max(intervals.intervalStart) })
    .from(intervals)
    .where(ofMeter(args));
  return row?.latest ?? null;
}
