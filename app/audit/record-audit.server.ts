import type { PoolClient } from "pg";
import type { Executor } from "~/db/client.server";
import { auditLog } from "~/db/schema";
import type { AuditAction } from "./kinds";

/**
 * One change for the audit trail: who (a person, a gateway, an API token, or
 * none for Stripe and Joulebook itself), what and where, why, and the values before
 * and after. Only the fields that changed go into before/after, each under
 * a name app/audit/describe.ts knows how to show.
 */
export interface AuditEntry {
  organizationId: string;
  actorUserId: string | null;
  actorGatewayId?: string | null;
  /** An organisation API token that made the change over the API. */
  actorTokenId?: string | null;
  action: AuditAction;
  /** The id of what changed (a meter, a member, a month …). */
  subject: string;
  siteId?: string | null;
  meterId?: string | null;
  reason?: string | null;
  before?: Record<string, unknown> | null;
  after?: Record<string, unknown> | null;
  /** Anything else worth keeping that is neither before nor after. */
  details?: Record<string, unknown>;
}

function row(entry: AuditEntry) {
  return {
    organizationId: entry.organizationId,
    actorUserId: entry.actorUserId,
    actorGatewayId: entry.actorGatewayId ?? null,
    actorTokenId: entry.actorTokenId ?? null,
    action: entry.action,
    subject: entry.subject,
    siteId: entry.siteId ?? null,
    meterId: entry.meterId ?? null,
    reason: entry.reason?.trim() || null,
    before: entry.before ?? null,
    after: entry.after ?? null,
    details: entry.details ?? {},
  };
}

/** Records a change inside the caller's (Drizzle) transaction. */
export async function recordAudit(
  tx: Executor,
  entry: AuditEntry,
): Promise<void> {
  await tx.insert(auditLog).values(row(entry));
}

/** The same, for code that holds a pg client in a transaction of its own. */
export async function recordAuditWith(
  client: PoolClient,
  entry: AuditEntry,
): Promise<void> {
  const r = row(entry);
  await client.query(
    `insert into audit_log (organization_id, actor_user_id, actor_gateway_id, actor_token_id, action,
                            subject, site_id, meter_id, reason, before, after, details)
     values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12)`,
    [
      r.organizationId,
      r.actorUserId,
      r.actorGatewayId,
      r.actorTokenId,
      r.action,
      r.subject,
      r.siteId,
      r.meterId,
      r.reason,
      r.before === null ? null : JSON.stringify(r.before),
      r.after === null ? null : JSON.stringify(r.after),
      JSON.stringify(r.details),
    ],
  );
}

/**
 * The fields of `after` whose values differ from `before`, as a pair of
 * objects holding only those fields; null when nothing changed. Values are
 * compared as JSON, so dates and numbers-as-text compare as stored.
 */
export function changedFields(
  before: Record<string, unknown>,
  after: Record<string, unknown>,
): { before: Record<string, unknown>; after: Record<string, unknown> } | null {
  const was: Record<string, unknown> = {};
  const now: Record<string, unknown> = {};
  for (const key of Object.keys(after)) {
    const a = JSON.stringify(before[key] ?? null);
    const b = JSON.stringify(after[key] ?? null);
    if (a !== b) {
      was[key] = before[key] ?? null;
      now[key] = after[key] ?? null;
    }
  }
  return Object.keys(now).length ? { before: was, after: now } : null;
}
