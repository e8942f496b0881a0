import { and, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { meters } from "~/db/schema";

export type IngestMeter = Awaited<ReturnType<typeof findMetersByCode>>[number];

/** The organisation's meters with these codes; others' meters are invisible. */
export async function findMetersByCode(
  organizationId: string,
  codes: string[],
) {
  if (codes.length === 0) return [];
  return db
    .select({
      id: meters.id,
      code: meters.code,
      quantity: meters.quantity,
      carrier: meters.carrier,
      orientation: meters.orientation,
      intervalMinutes: meters.intervalMinutes,
      multiplier: meters.multiplier,
      rolloverKwh: meters.rolloverKwh,
      sensorAt: meters.sensorAt,
      defaultPressureBarAbs: meters.defaultPressureBarAbs,
      accuracyClass: meters.accuracyClass,
      deltaThetaMinK: meters.deltaThetaMinK,
      qpM3PerH: meters.qpM3PerH,
      installedAt: meters.installedAt,
      removedAt: meters.removedAt,
    })
    .from(meters)
    .where(
      and(
        eq(meters.organizationId, organizationId),
        inArray(meters.code, codes),
      ),
    );
}
