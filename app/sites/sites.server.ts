import { and, asc, count, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { activeSitesOf, installedMetersOfSite } from "~/db/conditions.server";
import { isUniqueViolation } from "~/db/errors.server";
import { meters, sites } from "~/db/schema";
import { changedFields, recordAudit } from "~/audit/record-audit.server";
import { afterMeteredChange } from "~/billing/sync-quantity.server";
import type { SiteInput } from "./site-schema";

const siteColumns = {
  id: sites.id,
  name: sites.name,
  timeZone: sites.timeZone,
  floorAreaM2: sites.floorAreaM2,
  degreeDayBaseC: sites.degreeDayBaseC,
  address: sites.address,
  createdAt: sites.createdAt,
  archivedAt: sites.archivedAt,
};

export async function listSites({
  organizationId,
}: {
  organizationId: string;
}) {
  return db
    .select({
      ...siteColumns,
      meterCount: count(meters.id),
    })
    .from(sites)
    .leftJoin(meters, installedMetersOfSite)
    .where(activeSitesOf(organizationId))
    .groupBy(sites.organizationId, sites.id)
    .orderBy(asc(sites.name));
}

export async function getSite({
  organizationId,
  siteId,
}: {
  organizationId: string;
  siteId: string;
}) {
  const [site] = await db
    .select(siteColumns)
    .from(sites)
    .where(and(eq(sites.organizationId, organizationId), eq(sites.id, siteId)));
  return site ?? null;
}

export class DuplicateNameError extends Error {}

/** A site's details as the audit trail keeps them, read back as stored. */
const auditedColumns = {
  id: sites.id,
  name: sites.name,
  timeZone: sites.timeZone,
  floorAreaM2: sites.floorAreaM2,
  degreeDayBaseC: sites.degreeDayBaseC,
  address: sites.address,
};

function detailsOf(site: { id: string } & Record<string, unknown>) {
  const { id: _id, ...details } = site;
  return details;
}

export async function createSite(args: {
  organizationId: string;
  // The person who acts, or null with the API token that does (actorTokenId).
  actorUserId: string | null;
  actorTokenId?: string | null;
  input: SiteInput;
}) {
  try {
    return await db.transaction(async (tx) => {
      const [site] = await tx
        .insert(sites)
        .values({
          organizationId: args.organizationId,
          name: args.input.name,
          timeZone: args.input.timeZone,
          floorAreaM2: args.input.floorAreaM2?.toString() ?? null,
          degreeDayBaseC: args.input.degreeDayBaseC.toString(),
          address: args.input.address,
        })
        .returning(auditedColumns);
      await recordAudit(tx, {
        organizationId: args.organizationId,
        actorUserId: args.actorUserId,
        actorTokenId: args.actorTokenId,
        action: "site.created",
        subject: site.id,
        siteId: site.id,
        after: detailsOf(site),
      });
      return site.id;
    });
  } catch (error) {
    if (isUniqueViolation(error))
      throw new DuplicateNameError("A site with this name exists already.");
    throw error;
  }
}

export async function updateSite(args: {
  organizationId: string;
  // The person who acts, or null with the API token that does (actorTokenId).
  actorUserId: string | null;
  actorTokenId?: string | null;
  siteId: string;
  input: SiteInput;
}) {
  try {
    return await db.transaction(async (tx) => {
      const where = and(
        eq(sites.organizationId, args.organizationId),
        eq(sites.id, args.siteId),
      );
      const [before] = await tx
        .select(auditedColumns)
        .from(sites)
        .where(where)
        .for("update");
      if (!before) return false;
      const [after] = await tx
        .update(sites)
        .set({
          name: args.input.name,
          timeZone: args.input.timeZone,
          floorAreaM2: args.input.floorAreaM2?.toString() ?? null,
          degreeDayBaseC: args.input.degreeDayBaseC.toString(),
          address: args.input.address,
        })
        .where(where)
        .returning(auditedColumns);
      const changed = changedFields(detailsOf(before), detailsOf(after));
      if (changed)
        await recordAudit(tx, {
          organizationId: args.organizationId,
          actorUserId: args.actorUserId,
          actorTokenId: args.actorTokenId,
          action: "site.updated",
          subject: args.siteId,
          siteId: args.siteId,
          ...changed,
        });
      return true;
    });
  } catch (error) {
    if (isUniqueViolation(error))
      throw new DuplicateNameError("A site with this name exists already.");
    throw error;
  }
}

/**
 * Takes a site out of use: it leaves the site lists and the bill, and keeps
 * its meters and history. Archiving an archived site changes nothing.
 * False when the organisation has no such site.
 */
export async function archiveSite(args: {
  organizationId: string;
  // The person who acts, or null with the API token that does (actorTokenId).
  actorUserId: string | null;
  actorTokenId?: string | null;
  siteId: string;
  reason?: string;
}) {
  const archived = await db.transaction(async (tx) => {
    const where = and(
      eq(sites.organizationId, args.organizationId),
      eq(sites.id, args.siteId),
    );
    const [before] = await tx
      .select({ archivedAt: sites.archivedAt })
      .from(sites)
      .where(where)
      .for("update");
    if (!before) return null;
    if (before.archivedAt) return before.archivedAt;
    const [after] = await tx
      .update(sites)
      .set({ archivedAt: new Date() })
      .where(where)
      .returning({ archivedAt: sites.archivedAt });
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      actorTokenId: args.actorTokenId,
      action: "site.archived",
      subject: args.siteId,
      siteId: args.siteId,
      reason: args.reason,
      before: { archivedAt: null },
      after: { archivedAt: after.archivedAt },
    });
    return after.archivedAt;
  });
  // An archived site is no longer billed (after the commit, never failing).
  if (archived)
    await afterMeteredChange(
      args.organizationId,
      `site.archived:${args.siteId}`,
    );
  return archived !== null;
}
