import { and, asc, eq } from "drizzle-orm";
import { meterKey, siteOfMeter } from "~/db/conditions.server";
import { db, type Transaction } from "~/db/client.server";
import { intervals, meters, sites } from "~/db/schema";
import { changedFields, recordAudit } from "~/audit/record-audit.server";
import { afterMeteredChange } from "~/billing/sync-quantity.server";
import type { MeterInput } from "./meter-schema";
import { isUniqueViolation } from "~/db/errors.server";
import { DuplicateNameError } from "./sites.server";

export const meterColumns = {
  id: meters.id,
  siteId: meters.siteId,
  code: meters.code,
  name: meters.name,
  quantity: meters.quantity,
  carrier: meters.carrier,
  orientation: meters.orientation,
  intervalMinutes: meters.intervalMinutes,
  parentMeterId: meters.parentMeterId,
  position: meters.position,
  serial: meters.serial,
  multiplier: meters.multiplier,
  rolloverKwh: meters.rolloverKwh,
  sensorAt: meters.sensorAt,
  defaultPressureBarAbs: meters.defaultPressureBarAbs,
  spikeFactor: meters.spikeFactor,
  accuracyClass: meters.accuracyClass,
  deltaThetaMinK: meters.deltaThetaMinK,
  qpM3PerH: meters.qpM3PerH,
  installedAt: meters.installedAt,
  removedAt: meters.removedAt,
  replacedByMeterId: meters.replacedByMeterId,
};

export type MeterRow = Awaited<ReturnType<typeof listSiteMeters>>[number];

export async function listSiteMeters({
  organizationId,
  siteId,
}: {
  organizationId: string;
  siteId: string;
}) {
  return db
    .select(meterColumns)
    .from(meters)
    .where(
      and(eq(meters.organizationId, organizationId), eq(meters.siteId, siteId)),
    )
    .orderBy(asc(meters.code));
}

export async function listAllMeters({
  organizationId,
}: {
  organizationId: string;
}) {
  return db
    .select({ ...meterColumns, siteName: sites.name, timeZone: sites.timeZone })
    .from(meters)
    .innerJoin(sites, siteOfMeter)
    .where(eq(meters.organizationId, organizationId))
    .orderBy(asc(sites.name), asc(meters.code));
}

export async function getMeter({
  organizationId,
  meterId,
}: {
  organizationId: string;
  meterId: string;
}) {
  const [meter] = await db
    .select({ ...meterColumns, siteName: sites.name, timeZone: sites.timeZone })
    .from(meters)
    .innerJoin(sites, siteOfMeter)
    .where(meterKey(organizationId, meterId));
  return meter ?? null;
}

function columnsFrom(input: MeterInput) {
  return {
    code: input.code,
    name: input.name,
    quantity: input.quantity,
    carrier: input.carrier,
    orientation: input.orientation,
    intervalMinutes: input.intervalMinutes,
    parentMeterId: input.parentMeterId || null,
    position: input.position,
    serial: input.serial,
    multiplier: String(input.multiplier),
    rolloverKwh: input.rolloverKwh === null ? null : String(input.rolloverKwh),
    sensorAt: input.sensorAt === "" ? null : input.sensorAt,
    defaultPressureBarAbs:
      input.defaultPressureBarAbs === null
        ? null
        : String(input.defaultPressureBarAbs),
    spikeFactor: String(input.spikeFactor),
    accuracyClass:
      input.accuracyClass === "" ? null : Number(input.accuracyClass),
    deltaThetaMinK:
      input.deltaThetaMinK === null ? null : String(input.deltaThetaMinK),
    qpM3PerH: input.qpM3PerH === null ? null : String(input.qpM3PerH),
    installedAt: input.installedAt!,
  };
}

/** What the audit trail keeps of a meter's settings (its ids aside). */
function settingsOf(meter: MeterSettings): Record<string, unknown> {
  const { id: _id, siteId: _site, replacedByMeterId: _r, ...settings } = meter;
  return settings;
}
type MeterSettings = {
  [K in keyof typeof meterColumns]: (typeof meters.$inferSelect)[K];
};

export class MeterRuleError extends Error {}

/**
 * A meter's resolution is fixed once it has intervals: they were derived at
 * the old length, and re-cutting them would change figures already reported.
 */
export class ResolutionFixedError extends Error {}

async function assertResolutionChangeable(
  tx: Transaction,
  organizationId: string,
  meterId: string,
  from: number,
  to: number,
) {
  if (from === to) return;
  const [stored] = await tx
    .select({ meterId: intervals.meterId })
    .from(intervals)
    .where(
      and(
        eq(intervals.organizationId, organizationId),
        eq(intervals.meterId, meterId),
      ),
    )
    .limit(1);
  if (stored)
    throw new ResolutionFixedError(
      `This meter already has intervals of ${from} minutes; its resolution cannot change to ${to} minutes. Add a new meter for data at the new resolution.`,
    );
}

async function assertParentOnSite(
  organizationId: string,
  siteId: string,
  parentId: string,
  selfId?: string,
) {
  if (!parentId) return;
  if (parentId === selfId)
    throw new MeterRuleError("A meter cannot be its own parent.");
  const [parent] = await db
    .select({ siteId: meters.siteId })
    .from(meters)
    .where(meterKey(organizationId, parentId));
  if (!parent || parent.siteId !== siteId)
    throw new MeterRuleError("The parent meter must be on the same site.");
}

/** A transaction that writes a meter's code: a taken code is a DuplicateNameError. */
function writeMeter<T>(work: (tx: Transaction) => Promise<T>): Promise<T> {
  return db.transaction(work).catch((error: unknown) => {
    if (isUniqueViolation(error))
      throw new DuplicateNameError(
        "Another meter in this organisation uses this code.",
      );
    throw error;
  });
}

export async function createMeter(args: {
  organizationId: string;
  // The person who acts, or null with the API token that does (actorTokenId).
  actorUserId: string | null;
  actorTokenId?: string | null;
  siteId: string;
  input: MeterInput;
}) {
  await assertParentOnSite(
    args.organizationId,
    args.siteId,
    args.input.parentMeterId,
  );
  const meterId = await writeMeter(async (tx) => {
    const [meter] = await tx
      .insert(meters)
      .values({
        organizationId: args.organizationId,
        siteId: args.siteId,
        ...columnsFrom(args.input),
      })
      .returning(meterColumns);
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      actorTokenId: args.actorTokenId,
      action: "meter.created",
      subject: meter.id,
      siteId: args.siteId,
      meterId: meter.id,
      after: settingsOf(meter),
    });
    return meter.id;
  });
  // A site's first meter makes it billable (after the commit, never failing).
  await afterMeteredChange(args.organizationId, `meter.created:${meterId}`);
  return meterId;
}

export async function updateMeter(args: {
  organizationId: string;
  // The person who acts, or null with the API token that does (actorTokenId).
  actorUserId: string | null;
  actorTokenId?: string | null;
  meterId: string;
  siteId: string;
  input: MeterInput;
}) {
  await assertParentOnSite(
    args.organizationId,
    args.siteId,
    args.input.parentMeterId,
    args.meterId,
  );
  return writeMeter(async (tx) => {
    const where = meterKey(args.organizationId, args.meterId);
    const [before] = await tx
      .select(meterColumns)
      .from(meters)
      .where(where)
      .for("update");
    if (!before) return false;
    await assertResolutionChangeable(
      tx,
      args.organizationId,
      args.meterId,
      before.intervalMinutes,
      args.input.intervalMinutes,
    );
    const [after] = await tx
      .update(meters)
      .set(columnsFrom(args.input))
      .where(where)
      .returning(meterColumns);
    // Saving the form unchanged is no change, and leaves no entry.
    const changed = changedFields(settingsOf(before), settingsOf(after));
    if (changed)
      await recordAudit(tx, {
        organizationId: args.organizationId,
        actorUserId: args.actorUserId,
        actorTokenId: args.actorTokenId,
        action: "meter.updated",
        subject: args.meterId,
        siteId: after.siteId,
        meterId: args.meterId,
        ...changed,
      });
    return true;
  });
}

export async function retireMeter(args: {
  organizationId: string;
  // The person who acts, or null with the API token that does (actorTokenId).
  actorUserId: string | null;
  actorTokenId?: string | null;
  meterId: string;
  removedAt: Date;
  reason?: string;
}) {
  const retired = await db.transaction(async (tx) => {
    const where = meterKey(args.organizationId, args.meterId);
    const [before] = await tx
      .select({ siteId: meters.siteId, removedAt: meters.removedAt })
      .from(meters)
      .where(where)
      .for("update");
    if (!before) return false;
    await tx.update(meters).set({ removedAt: args.removedAt }).where(where);
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      actorTokenId: args.actorTokenId,
      action: "meter.retired",
      subject: args.meterId,
      siteId: before.siteId,
      meterId: args.meterId,
      reason: args.reason,
      before: { removedAt: before.removedAt },
      after: { removedAt: args.removedAt },
    });
    return true;
  });
  // A site's last meter going makes it no longer billable.
  if (retired)
    await afterMeteredChange(
      args.organizationId,
      `meter.retired:${args.meterId}:${args.removedAt.toISOString()}`,
    );
  return retired;
}

/**
 * A meter swap: the old meter is retired at the swap time and a new one with
 * the same settings takes its place, linked both ways through replaced_by.
 */
export async function replaceMeter(args: {
  organizationId: string;
  // The person who acts, or null with the API token that does (actorTokenId).
  actorUserId: string | null;
  actorTokenId?: string | null;
  meterId: string;
  code: string;
  serial: string;
  swappedAt: Date;
  reason?: string;
}) {
  const old = await getMeter({
    organizationId: args.organizationId,
    meterId: args.meterId,
  });
  if (!old) return null;
  return writeMeter(async (tx) => {
    const [replacement] = await tx
      .insert(meters)
      .values({
        organizationId: args.organizationId,
        siteId: old.siteId,
        code: args.code,
        name: old.name,
        quantity: old.quantity,
        carrier: old.carrier,
        orientation: old.orientation,
        intervalMinutes: old.intervalMinutes,
        parentMeterId: old.parentMeterId,
        serial: args.serial,
        multiplier: old.multiplier,
        rolloverKwh: old.rolloverKwh,
        sensorAt: old.sensorAt,
        defaultPressureBarAbs: old.defaultPressureBarAbs,
        spikeFactor: old.spikeFactor,
        accuracyClass: old.accuracyClass,
        deltaThetaMinK: old.deltaThetaMinK,
        qpM3PerH: old.qpM3PerH,
        installedAt: args.swappedAt,
      })
      .returning({ id: meters.id });
    await tx
      .update(meters)
      .set({ removedAt: args.swappedAt, replacedByMeterId: replacement.id })
      .where(meterKey(args.organizationId, args.meterId));
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      actorTokenId: args.actorTokenId,
      action: "meter.replaced",
      subject: args.meterId,
      siteId: old.siteId,
      meterId: args.meterId,
      reason: args.reason,
      before: { code: old.code, serial: old.serial, removedAt: null },
      after: {
        code: args.code,
        serial: args.serial,
        removedAt: args.swappedAt,
        replacementMeterId: replacement.id,
      },
    });
    return replacement.id;
  });
}
