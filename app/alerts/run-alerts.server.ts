import { and, eq, isNull } from "drizzle-orm";
import { db } from "~/db/client.server";
import {
  alertEvents,
  alertSettings,
  memberships,
  organizations,
  users,
} from "~/db/schema";
import { appUrl } from "~/env.server";
import { sendEmail } from "~/email/mailer.server";
import { alertsOnByDefault } from "./alert-settings.server";
import { NO_DATA_AFTER_HOURS } from "./no-data";
import { alertDigestEmail, type DigestSection } from "./digest-email.server";
import {
  monthReadyConditions,
  plantFaultConditions,
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
  const rows = await db
    .select({
      userId: users.id,
      email: users.email,
      name: users.name,
      role: memberships.role,
      silentMeter: alertSettings.silentMeter,
      residual: alertSettings.residual,
      monthReady: alertSettings.monthReady,
      plantFault: alertSettings.plantFault,
      silentHours: alertSettings.silentHours,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .leftJoin(
      alertSettings,
      and(
        eq(alertSettings.organizationId, memberships.organizationId),
        eq(alertSettings.userId, memberships.userId),
      ),
    )
    .where(eq(memberships.organizationId, organizationId));
  const list = rows.map((r) => {
    const byDefault = alertsOnByDefault(r.role);
    const kinds = new Set<AlertKind>();
    if (r.silentMeter ?? byDefault) kinds.add("silent_meter");
    if (r.residual ?? byDefault) kinds.add("residual");
    if (r.monthReady ?? byDefault) kinds.add("month_ready");
    if (r.plantFault ?? byDefault) kinds.add("plant_fault");
    return { userId: r.userId, email: r.email, name: r.name, kinds };
  });
  const hours = rows
    .map((r) => r.silentHours)
    .filter((h): h is number => h !== null);
  return {
    list,
    silentHours: hours.length ? Math.min(...hours) : NO_DATA_AFTER_HOURS,
  };
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
    ...(await plantFaultConditions(organizationId, now)),
  ];
  const openEvents = and(
    eq(alertEvents.organizationId, organizationId),
    isNull(alertEvents.clearedAt),
  );
  const active = await db
    .select({ kind: alertEvents.kind, subject: alertEvents.subject })
    .from(alertEvents)
    .where(openEvents);
  const key = (c: { kind: string; subject: string }) =>
    `${c.kind}|${c.subject}`;
  const holding = new Set(conditions.map(key));
  const activeKeys = new Set(active.map(key));
  const cleared = active.filter((a) => !holding.has(key(a)));
  for (const a of cleared) {
    await db
      .update(alertEvents)
      .set({ clearedAt: now })
      .where(
        and(
          openEvents,
          eq(alertEvents.kind, a.kind),
          eq(alertEvents.subject, a.subject),
        ),
      );
  }
  const opened: Condition[] = [];
  for (const c of conditions.filter((c) => !activeKeys.has(key(c)))) {
    // The unique index on open alerts makes a concurrent second run a
    // no-op: only the run whose insert took the condition mails it.
    const inserted = await db
      .insert(alertEvents)
      .values({
        organizationId,
        kind: c.kind,
        subject: c.subject,
        title: c.title,
        openedAt: now,
      })
      .onConflictDoNothing()
      .returning({ id: alertEvents.id });
    if (inserted.length > 0) opened.push(c);
  }
  const [org] = await db
    .select({ name: organizations.name })
    .from(organizations)
    .where(eq(organizations.id, organizationId));
  return {
    organizationId,
    organizationName: org?.name ?? "",
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
  const rows = await db.select({ id: organizations.id }).from(organizations);
  const checks: OrganizationCheck[] = [];
  for (const org of rows)
    await checkOrganization(org.id, now).then(
      (check) => checks.push(check),
      (error: unknown) => console.error("[alerts]", org.id, error),
    );
  return sendDigests(checks);
}
