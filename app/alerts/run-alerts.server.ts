import { pool } from "~/db/client.server";
import { appUrl } from "~/env.server";
import { sendEmail } from "~/email/mailer.server";
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
    const byDefault = r.role === "owner" || r.role === "energy_manager";
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

/**
 * Opens an alert for each new condition and e-mails it once; a condition
 * that still holds is not mailed again; one that no longer holds is cleared,
 * so that it can alert again if it comes back. Returns what was sent.
 */
export async function runAlerts(
  organizationId: string,
  now = new Date(),
): Promise<{ opened: Condition[]; cleared: number; emails: number }> {
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
  const opened = conditions.filter((c) => !activeKeys.has(key(c)));
  let emails = 0;
  for (const c of opened) {
    // The unique index on open alerts makes a concurrent second run a no-op.
    const { rowCount } = await pool.query(
      `insert into alert_events (organization_id, kind, subject, title, opened_at) values ($1, $2, $3, $4, $5)
       on conflict do nothing`,
      [organizationId, c.kind, c.subject, c.title, now],
    );
    if (!rowCount) continue;
    for (const r of list.filter((p) => p.kinds.has(c.kind))) {
      await sendEmail({
        to: r.email,
        subject: `Joulebook alert: ${c.title}`,
        text: `${c.title}\n\n${c.detail}\n\nOverview: ${appUrl()}/o/${organizationId}/overview\nAlert settings: ${appUrl()}/account\n`,
        html: `<p><strong>${escapeHtml(c.title)}</strong></p><p>${escapeHtml(c.detail)}</p><p><a href="${appUrl()}/o/${organizationId}/overview">Open the overview</a></p>`,
      }).then(
        () => (emails += 1),
        (error: unknown) => console.error("[alerts]", error),
      );
    }
  }
  return { opened, cleared: cleared.length, emails };
}

function escapeHtml(value: string): string {
  return value
    .replaceAll("&", "&amp;")
    .replaceAll("<", "&lt;")
    .replaceAll(">", "&gt;");
}

/** Every organisation, in turn: what the server's timer calls. */
export async function runAllAlerts(now = new Date()): Promise<void> {
  const { rows } = await pool.query<{ id: string }>(
    "select id from organizations",
  );
  for (const org of rows)
    await runAlerts(org.id, now).catch((error: unknown) =>
      console.error("[alerts]", org.id, error),
    );
}
