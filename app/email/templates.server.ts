import type { OutgoingEmail } from "./mailer.server";

/** Escapes text placed into the HTML part of a message. */
function escapeHtml(value: string): string {
  return value
    .replaceAll("&", "&amp;")
    .replaceAll("<", "&lt;")
    .replaceAll(">", "&gt;")
    .replaceAll('"', "&quot;");
}

function layout(
  title: string,
  paragraphs: string[],
  action: { label: string; url: string },
) {
  const body = paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("");
  return `<!doctype html><html><body style="font-family:sans-serif;color:#1c2430;max-width:560px">
<h1 style="font-size:20px">${escapeHtml(title)}</h1>${body}
<p><a href="${escapeHtml(action.url)}" style="background:#0f5c4c;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(action.label)}</a></p>
<p style="color:#5b6675;font-size:13px">Or paste this address into your browser: ${escapeHtml(action.url)}</p>
<p style="color:#5b6675;font-size:13px">Joulebook — energy ledger</p></body></html>`;
}

export function passwordResetEmail(
  to: string,
  url: string,
  minutes: number,
): OutgoingEmail {
  const lines = [
    "Someone asked to reset the password of your Joulebook account.",
    `The link works once and expires in ${minutes} minutes. If it was not you, ignore this message: your password stays as it is.`,
  ];
  return {
    to,
    tags: [{ name: "kind", value: "password_reset" }],
    subject: "Reset your Joulebook password",
    text: `${lines.join("\n\n")}\n\n${url}\n`,
    html: layout("Reset your password", lines, {
      label: "Choose a new password",
      url,
    }),
  };
}

export function invitationEmail(args: {
  to: string;
  organizationId: string;
  organizationName: string;
  inviterName: string;
  roleLabel: string;
  url: string;
  days: number;
}): OutgoingEmail {
  const lines = [
    `${args.inviterName} invited you to ${args.organizationName} on Joulebook as ${args.roleLabel}.`,
    `The invitation expires in ${args.days} days.`,
  ];
  return {
    to: args.to,
    // The Outbox shows an organisation's owners the invitations it sent.
    tags: [
      { name: "kind", value: "invitation" },
      { name: "organization", value: args.organizationId },
    ],
    subject: `Join ${args.organizationName} on Joulebook`,
    text: `${lines.join("\n\n")}\n\n${args.url}\n`,
    html: layout(`Join ${args.organizationName}`, lines, {
      label: "Accept the invitation",
      url: args.url,
    }),
  };
}

export function reportReadyEmail(args: {
  to: string;
  title: string;
  pageCount: number;
  sha256: string;
  allMonthsClosed: boolean;
  url: string;
}): OutgoingEmail {
  const lines = [
    `Your report “${args.title}” is signed and ready: ${args.pageCount} pages.`,
    args.allMonthsClosed
      ? "Every month in it was closed when it was made."
      : "Some of its months were still open, so it is marked provisional.",
    `SHA-256 of the file: ${args.sha256}. The Verify page checks any copy against it.`,
  ];
  return {
    to: args.to,
    subject: `Report ready: ${args.title}`,
    text: `${lines.join("\n\n")}\n\n${args.url}\n`,
    html: layout("Your report is ready", lines, {
      label: "Open Reports",
      url: args.url,
    }),
  };
}
