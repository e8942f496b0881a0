import { Resend } from "resend";
import { env } from "~/env.server";

/** Resend's message tags: ASCII letters, digits, `_` and `-` only. */
export interface EmailTag {
  name: string;
  value: string;
}

export interface OutgoingEmail {
  to: string;
  subject: string;
  text: string;
  html: string;
  tags?: EmailTag[];
}

let client: Resend | undefined;

// Built on first use so that the base URL (the local fake in development and
// tests) is read from the validated environment, not at import time.
function resend(): Resend {
  const { RESEND_API_KEY, RESEND_BASE_URL } = env();
  if (RESEND_BASE_URL) process.env.RESEND_BASE_URL = RESEND_BASE_URL;
  client ??= new Resend(RESEND_API_KEY);
  return client;
}

export class EmailDeliveryError extends Error {}

/** Sends one message; the SDK never throws on HTTP errors, so check `error`. */
export async function sendEmail(message: OutgoingEmail): Promise<string> {
  const result = await resend()
    .emails.send({ from: env().EMAIL_FROM, ...message })
    .catch((cause: unknown) => ({
      data: null,
      error: { message: String(cause) },
    }));
  if (result.error || !result.data) {
    throw new EmailDeliveryError(
      `The e-mail could not be sent: ${result.error?.message ?? "no answer"}`,
    );
  }
  return result.data.id;
}

export interface OutboxMessage {
  id: string;
  created_at: string;
  from: string;
  to: string[];
  subject: string;
  html: string | null;
  text: string | null;
  tags: EmailTag[];
}

/**
 * Reads the local fake's whole store, for the development Outbox page, which
 * shows each person only their own part (app/email/outbox-visibility.ts).
 */
export async function listOutbox(): Promise<OutboxMessage[]> {
  const base = env().RESEND_BASE_URL;
  if (!base) return [];
  const response = await fetch(`${base}/emails`);
  if (!response.ok) throw new Error(`Outbox unavailable (${response.status})`);
  const body = (await response.json()) as {
    data: (Omit<OutboxMessage, "tags"> & { tags?: EmailTag[] })[];
  };
  return body.data.map((m) => ({ ...m, tags: m.tags ?? [] }));
}
