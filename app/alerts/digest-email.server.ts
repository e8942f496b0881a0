import type { OutgoingEmail } from "~/email/mailer.server";
import type { Condition } from "./conditions.server";

/** The alerts one organisation's check opened for one person. */
export interface DigestSection {
  organizationName: string;
  overviewUrl: string;
  alerts: Condition[];
}

const WHOLE_ORGANISATION = "Whole organisation";

function escapeHtml(value: string): string {
  return value
    .replaceAll("&", "&amp;")
    .replaceAll("<", "&lt;")
    .replaceAll(">", "&gt;")
    .replaceAll('"', "&quot;");
}

/** Alerts by site, sites by name, the organisation-wide ones last. */
function bySite(alerts: Condition[]): [string, Condition[]][] {
  const groups = new Map<string, Condition[]>();
  for (const alert of alerts) {
    const site = alert.site ?? WHOLE_ORGANISATION;
    groups.set(site, [...(groups.get(site) ?? []), alert]);
  }
  const rank = (site: string) => (site === WHOLE_ORGANISATION ? 1 : 0);
  return [...groups].sort(
    ([a], [b]) => rank(a) - rank(b) || a.localeCompare(b),
  );
}

function subjectOf(sections: DigestSection[], count: number): string {
  if (count === 1) return `Joulebook alert: ${sections[0].alerts[0].title}`;
  return sections.length === 1
    ? `Joulebook: ${count} new alerts for ${sections[0].organizationName}`
    : `Joulebook: ${count} new alerts in ${sections.length} organisations`;
}

/**
 * One message with every alert a check opened for one person: by
 * organisation, then by site, each alert's title and detail.
 */
export function alertDigestEmail(args: {
  to: string;
  sections: DigestSection[];
}): OutgoingEmail {
  const count = args.sections.reduce((n, s) => n + s.alerts.length, 0);
  const intro =
    count === 1
      ? "A new alert since the last check:"
      : `${count} new alerts since the last check:`;
  const settings =
    "You choose which alerts you get under “Your alert e-mails” on the Overview page.";
  const text = [intro];
  const html = [`<p>${escapeHtml(intro)}</p>`];
  for (const section of args.sections) {
    text.push("", `== ${section.organizationName} ==`);
    html.push(
      `<h2 style="font-size:18px">${escapeHtml(section.organizationName)}</h2>`,
    );
    for (const [site, alerts] of bySite(section.alerts)) {
      text.push("", site);
      html.push(`<h3 style="font-size:15px">${escapeHtml(site)}</h3><ul>`);
      for (const alert of alerts) {
        text.push(`- ${alert.title}`, `  ${alert.detail}`);
        html.push(
          `<li><strong>${escapeHtml(alert.title)}</strong><br>${escapeHtml(alert.detail)}</li>`,
        );
      }
      html.push("</ul>");
    }
    text.push("", `Overview: ${section.overviewUrl}`);
    html.push(
      `<p><a href="${escapeHtml(section.overviewUrl)}">Open the overview of ${escapeHtml(section.organizationName)}</a></p>`,
    );
  }
  text.push("", settings, "");
  html.push(
    `<p style="color:#5b6675;font-size:13px">${escapeHtml(settings)}</p>`,
  );
  return {
    to: args.to,
    subject: subjectOf(args.sections, count),
    text: text.join("\n"),
    html: `<!doctype html><html><body style="font-family:sans-serif;color:#1c2430;max-width:640px">${html.join("")}</body></html>`,
  };
}
