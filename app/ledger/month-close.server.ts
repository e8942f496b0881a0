import { recordAuditWith } from "~/audit/record-audit.server";
import { pool } from "~/db/client.server";

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
  const { rows } = await pool.query(
    "select 1 from sites where organization_id = $1 and id = $2",
    [organizationId, siteId],
  );
  return rows.length === 1;
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
  const client = await pool.connect();
  try {
    await client.query("begin");
    const { rows: existing } = await client.query(
      `select site_id from month_closes
        where organization_id = $1 and month = $2 and reopened_at is null
          and (site_id is null or site_id = $3::uuid or $3::uuid is null)
        for update`,
      [target.organizationId, monthDate(target.month), target.siteId],
    );
    if (
      existing.some((c) => c.site_id === null || c.site_id === target.siteId)
    ) {
      await client.query("rollback");
      return {
        ok: false,
        reason: `${target.month} is already closed${existing.some((c) => c.site_id === null) ? " for the whole organisation" : ""}.`,
      };
    }
    await client.query(
      `insert into month_closes (organization_id, site_id, month, closed_by_user_id) values ($1, $2, $3, $4)`,
      [
        target.organizationId,
        target.siteId,
        monthDate(target.month),
        target.actorUserId,
      ],
    );
    await recordAuditWith(client, {
      organizationId: target.organizationId,
      actorUserId: target.actorUserId,
      action: "month.closed",
      subject: target.month,
      siteId: target.siteId,
      before: { state: "open" },
      after: { state: "closed" },
      details: { month: target.month },
    });
    await client.query("commit");
    return { ok: true };
  } catch (error) {
    await client.query("rollback").catch(() => undefined);
    if ((error as { code?: string }).code === "23505")
      return { ok: false, reason: `${target.month} is already closed.` };
    throw error;
  } finally {
    client.release();
  }
}

/** Owners only (checked by the caller): reopening is logged with its reason. */
export async function reopenMonth(
  target: MonthTarget & { reason: string },
): Promise<Outcome> {
  const client = await pool.connect();
  try {
    await client.query("begin");
    const { rows } = await client.query(
      `update month_closes set reopened_at = now(), reopened_by_user_id = $4, reopen_reason = $5
        where organization_id = $1 and month = $2 and reopened_at is null
          and site_id is not distinct from $3::uuid
        returning id, closed_at`,
      [
        target.organizationId,
        monthDate(target.month),
        target.siteId,
        target.actorUserId,
        target.reason,
      ],
    );
    if (rows.length === 0) {
      await client.query("rollback");
      return {
        ok: false,
        reason: `${target.month} is not closed${target.siteId ? " for this site" : " for the whole organisation"}.`,
      };
    }
    await recordAuditWith(client, {
      organizationId: target.organizationId,
      actorUserId: target.actorUserId,
      action: "month.reopened",
      subject: target.month,
      siteId: target.siteId,
      reason: target.reason,
      before: { state: "closed" },
      after: { state: "open" },
      details: { month: target.month, closedAt: rows[0].closed_at },
    });
    await client.query("commit");
    return { ok: true };
  } catch (error) {
    await client.query("rollback").catch(() => undefined);
    throw error;
  } finally {
    client.release();
  }
}
