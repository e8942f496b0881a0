/**
 * Reading the audit trail: one organisation's entries, newest first, with
 * the names of the people, sites, meters and gateways they refer to, and
 * their before/after values as readable lines. Every query is bounded by the
 * organisation, joins included, so no filter can reach another tenant.
 */
import { eq, inArray, or } from "drizzle-orm";
import { db, pool } from "~/db/client.server";
import { auditLog, memberships, meters, sites, users } from "~/db/schema";
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
    type: "person" | "gateway" | "system";
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
  site_id: string | null;
  site_name: string | null;
  time_zone: string | null;
  meter_id: string | null;
  meter_code: string | null;
  meter_name: string | null;
  member_name: string | null;
  member_email: string | null;
  subject_gateway_name: string | null;
  invitation_email: string | null;
}

/**
 * Every filter is a parameter that is either null (not filtering) or the
 * value to match, so the statement is fixed text. Hour corrections are
 * written by app/ingest/edit-interval.server.ts as `<meter>@<hour>` with
 * their values in details.from/to; they are placed here like the others.
 */
const ENTRIES_SQL = `
  with placed as (
    select a.*,
           coalesce(a.meter_id,
                    case when a.action = 'interval.edited'
                         then substring(a.subject from '^(${UUID_TEXT})@')::uuid end) as placed_meter_id,
           coalesce(a.before, case when a.action = 'interval.edited' then nullif(a.details->'from', 'null'::jsonb) end) as placed_before,
           -- A corrected hour is always "edited" afterwards; the entry keeps only its value.
           coalesce(a.after, case when a.action = 'interval.edited'
                                  then a.details->'to' || '{"quality": "edited"}'::jsonb end) as placed_after,
           coalesce(a.reason, case when a.action = 'interval.edited' then a.details->>'reason' end) as placed_reason
      from audit_log a
     where a.organization_id = $1
  )
  select p.id::text, p.occurred_at, p.action, p.subject, p.placed_reason as reason,
         p.placed_before as before, p.placed_after as after, p.details,
         p.actor_user_id, u.name as actor_name, p.actor_gateway_id, g.name as gateway_name,
         s.id as site_id, s.name as site_name, s.time_zone,
         m.id as meter_id, m.code as meter_code, m.name as meter_name,
         su.name as member_name, su.email as member_email,
         sg.name as subject_gateway_name, inv.email as invitation_email
    from placed p
    left join users u on u.id = p.actor_user_id
    left join gateways g on g.organization_id = p.organization_id and g.id = p.actor_gateway_id
    left join meters m on m.organization_id = p.organization_id and m.id = p.placed_meter_id
    left join sites s on s.organization_id = p.organization_id and s.id = coalesce(p.site_id, m.site_id)
    left join users su on p.action like 'member.%' and su.id = p.subject
    left join gateways sg on p.action like 'gateway.%' and sg.organization_id = p.organization_id
                         and sg.id::text = p.subject
    left join invitations inv on p.action like 'invitation.%' and inv.organization_id = p.organization_id
                             and inv.id::text = p.subject
   where ($2::uuid is null or s.id = $2::uuid)
     and ($3::uuid is null or m.id = $3::uuid)
     and ($4::text is null or p.actor_user_id = $4::text)
     and ($5::text[] is null or p.action = any($5::text[]))
     and ($6::date is null or p.occurred_at >= ($6::date)::timestamp at time zone $8::text)
     and ($7::date is null or p.occurred_at < ($7::date + 1)::timestamp at time zone $8::text)
     and ($9::text is null
          or coalesce(p.details->>'month', case when p.action like 'month.%' then p.subject end) = $9::text)
     and ($10::text is null or m.carrier::text = $10::text)
     and ($11::timestamptz is null or p.occurred_at >= $11::timestamptz)
     and ($12::bigint is null
          or (p.occurred_at, p.id) < (select c.occurred_at, c.id from audit_log c
                                        where c.organization_id = $1 and c.id = $12::bigint))
   order by p.occurred_at desc, p.id desc
   limit $13`;

function parameters(
  organizationId: string,
  f: AuditFilters,
  limit: number,
  before: number | null,
) {
  return [
    organizationId,
    f.siteId || null,
    f.meterId || null,
    f.personId || null,
    f.kind ? actionsOfKind(f.kind) : null,
    f.from || null,
    f.to || null,
    f.timeZone || "UTC",
    f.month || null,
    f.carrier || null,
    f.since ?? null,
    before,
    limit,
  ];
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
  const [{ rows }, codes] = await Promise.all([
    pool.query<Row>(
      ENTRIES_SQL,
      parameters(
        args.organizationId,
        args.filters,
        args.limit + 1,
        args.before ?? null,
      ),
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
