import { pool } from "~/db/client.server";
import { appUrl } from "~/env.server";
import { alertsOnByDefault } from "./alert-settings.server";
import { sendEmail } from "~/email/mailer.server";
import { alertDigestEmail, type DigestSection } from "./digest-email.server";
import {
  monthReadyConditions,
  residualConditions,
  silentMeterConditions,
  type AlertKind,
  type Condition,
} from "./conditions.server";

interface Recipient {
  userId: string;
  email: string;
  name: string;
  kinds: Set<AlertKind>;
}

/** Who wants which alerts; owners and energy managers are on unless they turned them off. */
async function recipients(
  organizationId: string,
): Promise<{ list: Recipient[]; silentHours: number }> {
  const { rows } = await pool.query<{
    user_id: string;
    email: string;
    name: string;
    role: string;
    silent_meter: boolean | null;
    residual: boolean | null;
    month_ready: boolean | null;
    silent_hours: number | null;
  }>(
    `select u.id as user_id, u.email, u.name, m.role, a.silent_meter, a.residual, a.month_ready, a.silent_hours
       from memberships m join users u on u.id = m.user_id
       left join alert_settings a on a.organization_id = m.organization_id and a.user_id = m.user_id
      where m.organization_id = $1`,
    [organizationId],
  );
  const list = rows.map((r) => {
    const byDefault = alertsOnByDefault(r.role);
    const kinds = new Set<AlertKind>();
    if (r.silent_meter ?? byDefault) kinds.add("silent_meter");
    if (r.residual ?? byDefault) kinds.add("residual");
    if (r.month_ready ?? byDefault) kinds.add("month_ready");
    return { userId: r.user_id, email: r.email, name: r.name, kinds };
  });
  const hours = rows
    .map((r) => r.silent_hours)
    .filter((h): h is number => h !== null);
  return { list, silentHours: hours.length ? Math.min(...hours) : 24 };
}

/** What one organisation's check opened and cleared, and who wants which kind. */
interface OrganizationCheck {
  organizationId: string;
  organizationName: string;
  opened: Condition[];
  cleared: number;
  recipients: Recipient[];
}

/**
 * Opens an alert for each new condition and clears those that no longer
 * hold, so that a condition that comes back alerts again. Sends nothing.
 */
async function checkOrganization(
  organizationId: string,
  now: Date,
): Promise<OrganizationCheck> {
  const { list, silentHours } = await recipients(organizationId);
  const conditions = [
    ...(await silentMeterConditions(organizationId, silentHours, now)),
    ...(await residualConditions(organizationId, now)),
    ...(await monthReadyConditions(organizationId, now)),
  ];
  const { rows: active } = await pool.query<{
    kind: AlertKind;
    subject: string;
  }>(
    "select kind, subject from alert_events where organization_id = $1 and cleared_at is null",
    [organizationId],
  );
  const key = (c: { kind: string; subject: string }) =>
    `${c.kind}|${c.subject}`;
  const holding = new Set(conditions.map(key));
  const activeKeys = new Set(active.map(key));
  const cleared = active.filter((a) => !holding.has(key(a)));
  for (const a of cleared) {
    await pool.query(
      "update alert_events set cleared_at = $4 where organization_id = $1 and kind = $2 and subject = $3 and cleared_at is null",
      [organizationId, a.kind, a.subject, now],
    );
  }
  const opened: Condition[] = [];
  for (const c of conditions.filter((c) => !activeKeys.has(key(c)))) {
    // The unique index on open alerts makes a concurrent second run a
    // no-op: only the run whose insert took the condition mails it.
    const { rowCount } = await pool.query(
      `insert into alert_events (organization_id, kind, subject, title, opened_at) values ($1, $2, $3, $4, $5)
       on conflict do nothing`,
      [organizationId, c.kind, c.subject, c.title, now],
    );
    if (rowCount) opened.push(c);
  }
  const { rows: org } = await pool.query<{ name: string }>(
    "select name from organizations where id = $1",
    [organizationId],
  );
  return {
    organizationId,
    organizationName: org[0]?.name ?? "",
    opened,
    cleared: cleared.length,
    recipients: list,
  };
}

/**
 * One e-mail per person with everything the checks opened for them (the
 * kinds they chose), instead of one per alert: a demo left alone for days
 * otherwise sends dozens at once. Returns the number sent.
 */
async function sendDigests(checks: OrganizationCheck[]): Promise<number> {
  const byPerson = new Map<
    string,
    { email: string; sections: DigestSection[] }
  >();
  for (const check of checks) {
    for (const person of check.recipients) {
      const alerts = check.opened.filter((c) => person.kinds.has(c.kind));
      if (alerts.length === 0) continue;
      const digest = byPerson.get(person.userId) ?? {
        email: person.email,
        sections: [],
      };
      digest.sections.push({
        organizationName: check.organizationName,
        overviewUrl: `${appUrl()}/o/${check.organizationId}/overview`,
        alerts,
      });
      byPerson.set(person.userId, digest);
    }
  }
  let emails = 0;
  for (const { email, sections } of byPerson.values()) {
    await sendEmail(alertDigestEmail({ to: email, sections })).then(
      () => (emails += 1),
      (error: unknown) => console.error("[alerts]", error),
    );
  }
  return emails;
}

/**
 * Checks one organisation and mails each person who wants any of what it
 * opened one digest of it. Returns what was opened and sent.
 */
export async function runAlerts(
  organizationId: string,
  now = new Date(),
): Promise<{ opened: Condition[]; cleared: number; emails: number }> {
  const check = await checkOrganization(organizationId, now);
  const emails = await sendDigests([check]);
  return { opened: check.opened, cleared: check.cleared, emails };
}

/**
 * Every organisation, in turn, then one digest per person over all of them
 * (someone in two organisations gets one message): what the server's timer
 * calls.
 */
export async function runAllAlerts(now = new Date()): Promise<number> {
  const { rows } = await pool.query<{ id: string }>(
    "select id from organizations",
  );
  const checks: OrganizationCheck[] = [];
  for (const org of rows)
    await checkOrganization(org.id, now).then(
      (check) => checks.push(check),
      (error: unknown) => console.error("[alerts]", org.id, error),
    );
  return sendDigests(checks);
}
