/**
 * The first invoice right after Checkout: Stripe announces it as a draft
 * (invoice.created) a moment before it is finalized and paid. Here the
 * fake's events are held back and handed over one at a time, so the page is
 * looked at in between, as a person coming back from Checkout may.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { db, pool, schema } from "../support/db";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const stripeUrl = inject("stripeUrl");
const WEBHOOK_SECRET = "whsec_test_joulebook_fake";

let org: MeteredOrg;
let finance: Client;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  org = await createMeteredOrg({ roles: ["owner", "finance"] });
  const member = org.org.members.find((m) => m.role === "finance")!;
  finance = new Client();
  await finance.signIn(member.email, member.password);
});
afterAll(() => pool.end());

async function fake(path: string, body: unknown = {}) {
  const response = await fetch(`${stripeUrl}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
  expect(response.status, path).toBe(200);
  return response.json();
}

/** Pays Checkout while the fake's events go nowhere; they stay in its log. */
async function payWithoutWebhooks() {
  const page = await (await finance.get(`/o/${org.org.id}/billing`)).text();
  const attempt = /name="attempt" value="([0-9a-f-]{36})"/.exec(page)![1];
  const started = await finance.post(`/o/${org.org.id}/billing`, {
    intent: "subscribe",
    attempt,
  });
  expect(started.status).toBe(303);
  const checkoutUrl = started.headers.get("location")!;
  const checkout = await (await fetch(checkoutUrl)).text();
  const action = /<form method="post" action="([^"]+)"/.exec(checkout)![1];
  const card = /name="card_number" value="([^"]+)"/.exec(checkout)![1];
  await fake("/_fake/flush");
  await fake("/_fake/webhook-endpoint", { url: null });
  try {
    const paid = await fetch(new URL(action, stripeUrl), {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ card_number: card }).toString(),
      redirect: "manual",
    });
    expect(paid.status).toBe(303);
  } finally {
    await fake("/_fake/webhook-endpoint", {
      url: `${baseUrl}/api/v1/billing/webhook`,
      secret: WEBHOOK_SECRET,
    });
  }
}

/** Hands one of this customer's held-back invoice events to the app. */
async function deliver(type: string) {
  const [account] = await db
    .select()
    .from(schema.billingAccounts)
    .where(eq(schema.billingAccounts.organizationId, org.org.id));
  const events = (await (
    await fetch(`${stripeUrl}/_fake/events?type=${type}`)
  ).json()) as {
    data: { id: string; data: { object: { customer: string } } }[];
  };
  const event = events.data.find(
    (e) => e.data.object.customer === account.stripeCustomerId,
  );
  if (!event) throw new Error(`no ${type} event for the customer`);
  await fake(`/_fake/events/${event.id}/redeliver`);
  await fake("/_fake/flush");
}

/** The text a person reads in each invoice row (markup and attributes gone). */
async function invoiceRowsShown(): Promise<string[]> {
  const html = await (await finance.get(`/o/${org.org.id}/billing`)).text();
  return [...html.matchAll(/<tr data-invoice="[^"]*">([\s\S]*?)<\/tr>/g)].map(
    (m) =>
      m[1]
        .replace(/<[^>]+>/g, " ")
        .replace(/<!-- -->/g, "")
        .replace(/\s+/g, " ")
        .trim(),
  );
}

describe("the first invoice, right after paying", () => {
  it("a draft shows as being prepared, then as paid with its number", async () => {
    await payWithoutWebhooks();
    await deliver("invoice.created");
    const [stored] = await db
      .select()
      .from(schema.billingInvoices)
      .where(eq(schema.billingInvoices.organizationId, org.org.id));
    expect(stored).toMatchObject({ status: "draft", number: null });

    const [draft] = await invoiceRowsShown();
    expect(draft).toContain("Not numbered yet");
    expect(draft).toContain("Being prepared");
    expect(draft).not.toContain(stored.stripeInvoiceId);
    expect(draft).not.toMatch(/draft|£0\.00/);

    await deliver("invoice.finalized");
    await deliver("invoice.paid");
    const [paid] = await invoiceRowsShown();
    expect(paid).toMatch(/^JB-FAKE-\d{4} /);
    expect(paid).toContain("£29.00 £29.00 Paid");
  });
});
