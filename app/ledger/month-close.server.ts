import { and, eq, isNull, or, sql } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db } from "~/db/client.server";
import { isUniqueViolation } from "~/db/errors.server";
import { monthCloses, sites } from "~/db/schema";

type Outcome = { ok: true } | { ok: false; reason: string };

interface MonthTarget {
  organizationId: string;
  actorUserId: string;
  /** YYYY-MM */
  month: string;
  /** null: the whole organisation */
  siteId: string | null;
}

function monthDate(month: string): string {
  return `${month}-01`;
}

/** A month can be closed once it has ended everywhere (UTC+14 is the earliest). */
function hasEnded(month: string, now = new Date()): boolean {
  const [y, m] = month.split("-").map(Number);
  return Date.UTC(y, m, 1) - 14 * 3_600_000 <= now.getTime();
}

async function siteBelongs(
  organizationId: string,
  siteId: string | null,
): Promise<boolean> {
  if (!siteId) return true;
  const [site] = await db
    .select({ id: sites.id })
    .from(sites)
    .where(and(eq(sites.organizationId, organizationId), eq(sites.id, siteId)));
  return site !== undefined;
}

/** The close of exactly this scope: the site's own, or the organisation's. */
function sameScope(siteId: string | null) {
  return siteId === null
    ? isNull(monthCloses.siteId)
    : eq(monthCloses.siteId, siteId);
}

function activeClosesOf(organizationId: string, month: string) {
  return and(
    eq(monthCloses.organizationId, organizationId),
    eq(monthCloses.month, monthDate(month)),
    isNull(monthCloses.reopenedAt),
  );
}

/**
 * Locks a month for a site or the organisation. From then on, a change to its
 * hours is an adjusting entry, and the ledger shows the closed figures.
 */
export async function closeMonth(target: MonthTarget): Promise<Outcome> {
  if (!hasEnded(target.month))
    return {
      ok: false,
      reason: "A month can be closed only after it has ended.",
    };
  if (!(await siteBelongs(target.organizationId, target.siteId)))
    return { ok: false, reason: "No such site." };
  try {
    return await db.transaction(async (tx): Promise<Outcome> => {
      // An organisation-wide close covers every site; a site's close is
      // refused under either its own close or the organisation's.
      const existing = await tx
        .select({ siteId: monthCloses.siteId })
        .from(monthCloses)
        .where(
          and(
            activeClosesOf(target.organizationId, target.month),
            target.siteId === null
              ? undefined
              : or(
                  isNull(monthCloses.siteId),
                  eq(monthCloses.siteId, target.siteId),
                ),
          ),
        )
        .for("update");
      const wholeOrganisation = existing.some((c) => c.siteId === null);
      if (wholeOrganisation || existing.some((c) => c.siteId === target.siteId))
        return {
          ok: false,
          reason: `${target.month} is already closed${wholeOrganisation ? " for the whole organisation" : ""}.`,
        };
      await tx.insert(monthCloses).values({
        organizationId: target.organizationId,
        siteId: target.siteId,
        month: monthDate(target.month),
        closedByUserId: target.actorUserId,
      });
      await recordAudit(tx, {
        organizationId: target.organizationId,
        actorUserId: target.actorUserId,
        action: "month.closed",
        subject: target.month,
        siteId: target.siteId,
        before: { state: "open" },
        after: { state: "closed" },
        details: { month: target.month },
      });
      return { ok: true };
    });
  } catch (error) {
    // A simultaneous close of the same scope won the unique index.
    if (isUniqueViolation(error))
      return { ok: false, reason: `${target.month} is already closed.` };
    throw error;
  }
}

/** Owners only (checked by the caller): reopening is logged with its reason. */
export async function reopenMonth(
  target: MonthTarget & { reason: string },
): Promise<Outcome> {
  return db.transaction(async (tx): Promise<Outcome> => {
    const [reopened] = await tx
      .update(monthCloses)
      .set({
        reopenedAt: sql`now()`,
        reopenedByUserId: target.actorUserId,
        reopenReason: target.reason,
      })
      .where(
        and(
          activeClosesOf(target.organizationId, target.month),
          sameScope(target.siteId),
        ),
      )
      .returning({ closedAt: monthCloses.closedAt });
    if (!reopened)
      return {
        ok: false,
        reason: `${target.month} is not closed${target.siteId ? " for this site" : " for the whole organisation"}.`,
      };
    await recordAudit(tx, {
      organizationId: target.organizationId,
      actorUserId: target.actorUserId,
      action: "month.reopened",
      subject: target.month,
      siteId: target.siteId,
      reason: target.reason,
      before: { state: "closed" },
      after: { state: "open" },
      details: { month: target.month, closedAt: reopened.closedAt },
    });
    return { ok: true };
  });
}
