/**
 * What a meter sent last, so a person can continue a register series by
 * hand: the newest reading's time and the newest register value as read
 * (before the meter's multiplier). Reads raw_readings by its primary key
 * (organization_id, meter_id, reading_time), newest first.
 */
import { and, desc, eq, isNotNull } from "drizzle-orm";
import { db } from "~/db/client.server";
import { rawReadings } from "~/db/schema";

export interface LastReading {
  /** When the newest reading was taken (an interval's end). */
  at: Date | null;
  /** The newest register value as read, kWh; null when the meter sends none. */
  registerKwh: string | null;
  registerAt: Date | null;
}

export async function lastReadingOf(key: {
  organizationId: string;
  meterId: string;
}): Promise<LastReading> {
  const ofMeter = and(
    eq(rawReadings.organizationId, key.organizationId),
    eq(rawReadings.meterId, key.meterId),
  );
  const newest = (where = ofMeter) =>
    db
      .select({
        readingTime: rawReadings.readingTime,
        endTime: rawReadings.endTime,
        registerKwh: rawReadings.registerKwh,
      })
      .from(rawReadings)
      .where(where)
      .orderBy(desc(rawReadings.readingTime))
      .limit(1);
  const [[last], [register]] = await Promise.all([
    newest(),
    newest(and(ofMeter, isNotNull(rawReadings.registerKwh))),
  ]);
  return {
    at: last ? (last.endTime ?? last.readingTime) : null,
    registerKwh: register?.registerKwh ?? null,
    registerAt: register?.readingTime ?? null,
  };
}
