/**
 * Reading the audit trail: one organisation's entries, newest first, with
 * the names of the people, sites, meters and gateways they refer to, and
 * their before/after values as readable lines. Every query is bounded by the
 * organisation, joins included, so no filter can reach another tenant.
 */
import {
  and,
  desc,
  eq,
  gte,
  inArray,
  like,
  lt,
  or,
  sql,
  type SQL,
} from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db } from "~/db/client.server";
import {
  apiTokens,
  auditLog,
  gateways,
  invitations,
  memberships,
  meters,
  sites,
  users,
} from "~/db/schema";
import { dateTimeIn, monthLong } from "~/lib/format";
import { UUID_TEXT } from "~/lib/ids";
import { describeChanges, type ChangeLine } from "./describe";
import {
  actionLabel,
  actionsOfKind,
  auditKindLabels,
  kindOf,
  type AuditKind,
} from "./kinds";

export interface AuditFilters {
  siteId?: string | null;
  meterId?: string | null;
  /** The person who made the change. */
  personId?: string | null;
  kind?: AuditKind | null;
  /** First and last day (YYYY-MM-DD), both included, in `timeZone`. */
  from?: string | null;
  to?: string | null;
  timeZone?: string;
  /** The ledger month an entry concerns (YYYY-MM): adjusting entries, closes. */
  month?: string | null;
  /** Entries about meters of this carrier. */
  carrier?: string | null;
  /**
   * Entries made at or after this instant (a month's close, from the
   * Ledger), as ISO 8601 text: PostgreSQL reads its microseconds, which a
   * JavaScript Date would round away.
   */
  since?: string | null;
}

export interface AuditEntryView {
  id: number;
  occurred_at: string;
  action: string;
  action_label: string;
  kind: AuditKind | null;
  kind_label: string | null;
  actor: {
    type: "person" | "gateway" | "token" | "system";
    id: string | null;
    name: string;
  };
  site: { id: string; name: string } | null;
  meter: { id: string; code: string; name: string } | null;
  /** What changed, in words: a month, a member, an hour … */
  subject: string;
  reason: string | null;
  changes: ChangeLine[];
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  details: Record<string, unknown>;
}

interface Row {
  id: string;
  occurred_at: Date;
  action: string;
  subject: string;
  reason: string | null;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  details: Record<string, unknown>;
  actor_user_id: string | null;
  actor_name: string | null;
  actor_gateway_id: string | null;
  gateway_name: string | null;
  actor_token_id: string | null;
  token_name: string | null;
  site_id: string | null;
  site_name: string | null;
  time_zone: string | null;
  meter_id: string | null;
  meter_code: string | null;
  meter_name: string | null;
  member_name: string | null;
  member_email: string | null;
  subject_gateway_name: string | null;
  subject_token_name: string | null;
  invitation_email: string | null;
}

/**
 * Hour corrections are written by app/ingest/edit-interval.server.ts as
 * `<meter>@<hour>` with their values in details.from/to; these expressions
 * place them like the other entries (their meter, before, after, reason).
 */
const edited = sql`${auditLog.action} = 'interval.edited'`;
const placedMeterId = sql`coalesce(${auditLog.meterId}, case when ${edited} then substring(${auditLog.subject} from ${`^(${UUID_TEXT})@`})::uuid end)`;
const placedBefore = sql<Record<
  string,
  unknown
> | null>`coalesce(${auditLog.before}, case when ${edited} then nullif(${auditLog.details}->'from', 'null'::jsonb) end)`;
// A corrected hour is always "edited" afterwards; the entry keeps only its value.
const placedAfter = sql<Record<
  string,
  unknown
> | null>`coalesce(${auditLog.after}, case when ${edited} then ${auditLog.details}->'to' || '{"quality": "edited"}'::jsonb end)`;
const placedReason = sql<
  string | null
>`coalesce(${auditLog.reason}, case when ${edited} then ${auditLog.details}->>'reason' end)`;

/** The entry a page follows, for keyset paging. */
const cursor = alias(auditLog, "c");

/** The filters that are set, as conditions on the joined entry. */
function filterConditions(
  organizationId: string,
  f: AuditFilters,
  before: number | null,
): SQL[] {
  const timeZone = f.timeZone || "UTC";
  const conditions: (SQL | undefined)[] = [
    eq(auditLog.organizationId, organizationId),
    f.siteId ? eq(sites.id, f.siteId) : undefined,
    f.meterId ? eq(meters.id, f.meterId) : undefined,
    f.personId ? eq(auditLog.actorUserId, f.personId) : undefined,
    f.kind ? inArray(auditLog.action, actionsOfKind(f.kind)) : undefined,
    f.from
      ? gte(
          auditLog.occurredAt,
          sql`(${f.from}::date)::timestamp at time zone ${timeZone}::text`,
        )
      : undefined,
    f.to
      ? lt(
          auditLog.occurredAt,
          sql`(${f.to}::date + 1)::timestamp at time zone ${timeZone}::text`,
        )
      : undefined,
    f.month
      ? sql`coalesce(${auditLog.details}->>'month', case when ${auditLog.action} like 'month.%' then ${auditLog.subject} end) = ${f.month}::text`
      : undefined,
    f.carrier ? sql`${meters.carrier}::text = ${f.carrier}::text` : undefined,
    // Kept as text: PostgreSQL reads its microseconds.
    f.since != null
      ? gte(auditLog.occurredAt, sql`${f.since}::timestamptz`)
      : undefined,
    before !== null
      ? sql`(${auditLog.occurredAt}, ${auditLog.id}) < (${db
          .select({ at: cursor.occurredAt, id: cursor.id })
          .from(cursor)
          .where(
            and(
              eq(cursor.organizationId, organizationId),
              eq(cursor.id, before),
            ),
          )})`
      : undefined,
  ];
  return conditions.filter((c) => c !== undefined);
}

const subjectMember = alias(users, "su");
const subjectGateway = alias(gateways, "sg");
const subjectToken = alias(apiTokens, "st");

/** Entries newest first, with the names they refer to. */
function entries(
  organizationId: string,
  filters: AuditFilters,
  limit: number,
  before: number | null,
): Promise<Row[]> {
  return db
    .select({
      id: sql<string>`${auditLog.id}::text`,
      occurred_at: auditLog.occurredAt,
      action: auditLog.action,
      subject: auditLog.subject,
      reason: placedReason,
      before: placedBefore,
      after: placedAfter,
      details: auditLog.details,
      actor_user_id: auditLog.actorUserId,
      actor_name: users.name,
      actor_gateway_id: auditLog.actorGatewayId,
      gateway_name: gateways.name,
      actor_token_id: auditLog.actorTokenId,
      token_name: apiTokens.name,
      site_id: sites.id,
      site_name: sites.name,
      time_zone: sites.timeZone,
      meter_id: meters.id,
      meter_code: meters.code,
      meter_name: meters.name,
      member_name: subjectMember.name,
      member_email: subjectMember.email,
      subject_gateway_name: subjectGateway.name,
      subject_token_name: subjectToken.name,
      invitation_email: invitations.email,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorUserId))
    .leftJoin(
      gateways,
      and(
        eq(gateways.organizationId, auditLog.organizationId),
        eq(gateways.id, auditLog.actorGatewayId),
      ),
    )
    .leftJoin(
      apiTokens,
      and(
        eq(apiTokens.organizationId, auditLog.organizationId),
        eq(apiTokens.id, auditLog.actorTokenId),
      ),
    )
    .leftJoin(
      meters,
      and(
        eq(meters.organizationId, auditLog.organizationId),
        eq(meters.id, placedMeterId),
      ),
    )
    .leftJoin(
      sites,
      and(
        eq(sites.organizationId, auditLog.organizationId),
        eq(sites.id, sql`coalesce(${auditLog.siteId}, ${meters.siteId})`),
      ),
    )
    .leftJoin(
      subjectMember,
      and(
        like(auditLog.action, "member.%"),
        eq(subjectMember.id, auditLog.subject),
      ),
    )
    .leftJoin(
      subjectGateway,
      and(
        like(auditLog.action, "gateway.%"),
        eq(subjectGateway.organizationId, auditLog.organizationId),
        sql`${subjectGateway.id}::text = ${auditLog.subject}`,
      ),
    )
    .leftJoin(
      subjectToken,
      and(
        like(auditLog.action, "api_token.%"),
        eq(subjectToken.organizationId, auditLog.organizationId),
        sql`${subjectToken.id}::text = ${auditLog.subject}`,
      ),
    )
    .leftJoin(
      invitations,
      and(
        like(auditLog.action, "invitation.%"),
        eq(invitations.organizationId, auditLog.organizationId),
        sql`${invitations.id}::text = ${auditLog.subject}`,
      ),
    )
    .where(and(...filterConditions(organizationId, filters, before)))
    .orderBy(desc(auditLog.occurredAt), desc(auditLog.id))
    .limit(limit);
}

function monthName(month: unknown): string {
  if (typeof month !== "string") return "";
  return monthLong(month);
}

/** The corrected hour in its site's own time, as the Readings page shows it. */
function hourText(subject: string, timeZone: string | null): string {
  const at = new Date(subject.split("@")[1] ?? "");
  if (Number.isNaN(at.getTime())) return subject;
  const zone = timeZone ?? "UTC";
  return `Hour from ${dateTimeIn(at, zone)} (${zone})`;
}

const text = (value: unknown): string =>
  typeof value === "string" ? value : "";

/** What an entry is about, in words, for the Subject column. */
function subjectText(row: Row): string {
  const after = row.after ?? {};
  const details = row.details ?? {};
  switch (row.action.split(".")[0]) {
    case "interval":
      return hourText(row.subject, row.time_zone);
    case "ledger":
      return monthName(details.month);
    case "month":
      return `${monthName(row.subject)}, ${row.site_name ?? "whole organisation"}`;
    case "meter":
      return row.meter_code ? `${row.meter_code} · ${row.meter_name}` : "";
    case "site":
    case "weather":
      return row.site_name ?? "";
    case "gateway":
      return row.subject_gateway_name ?? text(after.name);
    case "api_token":
      return row.subject_token_name ?? text(after.name);
    case "member":
      return row.member_name
        ? `${row.member_name} (${row.member_email})`
        : "A former member";
    case "invitation":
      return row.invitation_email ?? text(after.email);
    case "organization":
      return text(after.name);
    case "billing":
      if (row.action === "billing.invoice_changed")
        return `Invoice ${text(details.number) || row.subject}`;
      return row.action === "billing.opened"
        ? "Billing account"
        : "Subscription";
    case "baseline":
      return `Baseline ${monthName(after.from)} to ${monthName(after.to)}`;
    case "report":
      return text(after.title);
    default:
      return row.subject;
  }
}

/** Who made the change: a person, a gateway, or Stripe or Joulebook itself. */
function actorOf(row: Row): AuditEntryView["actor"] {
  if (row.actor_user_id)
    return {
      type: "person",
      id: row.actor_user_id,
      name: row.actor_name ?? "A former user",
    };
  if (row.actor_gateway_id)
    return {
      type: "gateway",
      id: row.actor_gateway_id,
      name: `Gateway ${row.gateway_name ?? "(removed)"}`,
    };
  if (row.actor_token_id)
    return {
      type: "token",
      id: row.actor_token_id,
      name: `API token ${row.token_name ?? "(removed)"}`,
    };
  const fromStripe = row.reason?.startsWith("Stripe event") ?? false;
  return {
    type: "system",
    id: null,
    name: fromStripe ? "Stripe" : "Joulebook",
  };
}

function view(row: Row, meterCodes: ReadonlyMap<string, string>) {
  const kind = kindOf(row.action);
  return {
    id: Number(row.id),
    occurred_at: row.occurred_at.toISOString(),
    action: row.action,
    action_label: actionLabel(row.action),
    kind,
    kind_label: kind ? auditKindLabels[kind] : null,
    actor: actorOf(row),
    site: row.site_id ? { id: row.site_id, name: row.site_name! } : null,
    meter: row.meter_id
      ? { id: row.meter_id, code: row.meter_code!, name: row.meter_name! }
      : null,
    subject: subjectText(row),
    reason: row.reason,
    changes: describeChanges(row.before, row.after, { meterCodes }),
    before: row.before,
    after: row.after,
    details: row.details,
  } satisfies AuditEntryView;
}

async function meterCodes(organizationId: string) {
  const rows = await db
    .select({ id: meters.id, code: meters.code })
    .from(meters)
    .where(eq(meters.organizationId, organizationId));
  return new Map(rows.map((r) => [r.id, r.code]));
}

/**
 * One page of entries, newest first. `before` is the id of the last entry
 * of the previous page; `more` says whether older entries follow.
 */
export async function listAuditEntries(args: {
  organizationId: string;
  filters: AuditFilters;
  limit: number;
  before?: number | null;
}): Promise<{ entries: AuditEntryView[]; more: boolean }> {
  const [rows, codes] = await Promise.all([
    entries(
      args.organizationId,
      args.filters,
      args.limit + 1,
      args.before ?? null,
    ),
    meterCodes(args.organizationId),
  ]);
  return {
    entries: rows.slice(0, args.limit).map((row) => view(row, codes)),
    more: rows.length > args.limit,
  };
}

/** The sites, meters and people the page's filters offer, retired ones too. */
export async function auditFilterOptions(organizationId: string) {
  const [siteOptions, meterOptions, people] = await Promise.all([
    db
      .select({ id: sites.id, name: sites.name })
      .from(sites)
      .where(eq(sites.organizationId, organizationId))
      .orderBy(sites.name),
    db
      .select({
        id: meters.id,
        code: meters.code,
        name: meters.name,
        siteId: meters.siteId,
      })
      .from(meters)
      .where(eq(meters.organizationId, organizationId))
      .orderBy(meters.code),
    // Members now, and anyone who made a change here before leaving.
    db
      .select({ id: users.id, name: users.name })
      .from(users)
      .where(
        or(
          inArray(
            users.id,
            db
              .select({ id: memberships.userId })
              .from(memberships)
              .where(eq(memberships.organizationId, organizationId)),
          ),
          inArray(
            users.id,
            db
              .select({ id: auditLog.actorUserId })
              .from(auditLog)
              .where(eq(auditLog.organizationId, organizationId)),
          ),
        ),
      )
      .orderBy(users.name),
  ]);
  return { sites: siteOptions, meters: meterOptions, people };
}
