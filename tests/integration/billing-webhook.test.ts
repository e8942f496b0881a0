/**
 * POST /api/v1/billing/webhook: signatures over the raw body, each event
 * applied once, the live subscription stored whatever order events come in,
 * unknown customers recorded and ignored, and reconciliation finding what a
 * lost webhook did not bring.
 */
import { randomUUID } from "node:crypto";
import { format } from "date-fns";
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";

const SECRET = "whsec_test_joulebook_fake";
const LOOKUP_KEY = "joulebook_metered_site_monthly";
const stripe = new Stripe("sk_test_joulebook", { telemetry: false });
const now = () => Math.floor(Date.now() / 1000);
const baseUrl = inject("baseUrl");
const stripeUrl = inject("stripeUrl");
const fakeAddress = new URL(stripeUrl);
const sdk = new Stripe("sk_test_joulebook", {
  host: fakeAddress.hostname,
  port: Number(fakeAddress.port),
  protocol: "http",
  maxNetworkRetries: 0,
  telemetry: false,
});

afterAll(() => pool.end());

let organizationId: string;
let customerId: string;
let owner: Client;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  const org = await createOrganization(["owner"]);
  organizationId = org.id;
  owner = new Client();
  await owner.signIn(org.members[0].email, org.members[0].password);
  // The first visit opens the account: a Stripe customer and the trial.
  expect((await owner.get(`/o/${org.id}/billing`)).status).toBe(200);
  customerId = (await account()).stripeCustomerId;
});

async function account(id = organizationId) {
  const [row] = await db
    .select()
    .from(schema.billingAccounts)
    .where(eq(schema.billingAccounts.organizationId, id));
  return row;
}

async function fake(path: string, body: unknown = {}) {
  const response = await fetch(`${stripeUrl}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
  expect(response.status, path).toBe(200);
  return response.json();
}

/** Runs `fn` while the fake's events go nowhere, as if every one were lost. */
async function withoutWebhooks<T>(fn: () => Promise<T>): Promise<T> {
  await fake("/_fake/flush");
  await fake("/_fake/webhook-endpoint", { url: null });
  try {
    return await fn();
  } finally {
    await fake("/_fake/webhook-endpoint", {
      url: `${baseUrl}/api/v1/billing/webhook`,
      secret: SECRET,
    });
  }
}

async function sitePrice(): Promise<string> {
  const found = await sdk.prices.list({
    lookup_keys: [LOOKUP_KEY],
    active: true,
    limit: 1,
  });
  if (found.data[0]) return found.data[0].id;
  const product = await sdk.products.create({ name: "Joulebook test site" });
  const price = await sdk.prices.create({
    product: product.id,
    currency: "gbp",
    unit_amount: 2900,
    recurring: { interval: "month" },
    lookup_key: LOOKUP_KEY,
  });
  return price.id;
}

/** A subscription made in Stripe directly (one site: the organisation has none metered). */
async function subscriptionFor(customer: string, organization: string) {
  return sdk.subscriptions.create({
    customer,
    items: [{ price: await sitePrice(), quantity: 1 }],
    metadata: { organization_id: organization },
  });
}

function eventAbout(id: string, type: string, object: object, created = now()) {
  return {
    id,
    object: "event",
    api_version: "2026-10-28.endive",
    created,
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type,
    data: { object },
  };
}

/** A subscription event with made-up content, for the signature checks. */
function subscriptionEvent(
  id: string,
  status: string,
  customer = customerId,
  quantity = 3,
) {
  return eventAbout(id, "customer.subscription.updated", {
    id: `sub_test_${organizationId.slice(0, 8)}`,
    object: "subscription",
    customer,
    status,
    cancel_at_period_end: false,
    metadata: { organization_id: organizationId },
    items: {
      object: "list",
      data: [
        {
          id: "si_test_1",
          object: "subscription_item",
          quantity,
          current_period_end: now() + 30 * 86_400,
          price: { id: "price_test", lookup_key: LOOKUP_KEY },
        },
      ],
    },
  });
}

function invoiceEvent(id: string, type: string, status: string) {
  return {
    id,
    object: "event",
    created: now(),
    type,
    data: {
      object: {
        id: `in_test_${organizationId.slice(0, 8)}`,
        object: "invoice",
        customer: customerId,
        number: "TEST-0001",
        status,
        currency: "gbp",
        amount_due: 5800,
        amount_paid: status === "paid" ? 5800 : 0,
        period_start: now() - 30 * 86_400,
        period_end: now(),
        hosted_invoice_url: null,
        created: now(),
        parent: {
          type: "subscription_details",
          subscription_details: {
            subscription: `sub_test_${organizationId.slice(0, 8)}`,
            metadata: null,
          },
        },
      },
    },
  };
}

async function deliver(event: unknown, signature?: string) {
  const payload = JSON.stringify(event);
  const headers: Record<string, string> = {};
  if (signature !== "none")
    headers["stripe-signature"] =
      signature ??
      stripe.webhooks.generateTestHeaderString({ payload, secret: SECRET });
  return new Client().postJson("/api/v1/billing/webhook", payload, headers);
}

async function recorded(eventId: string) {
  return db
    .select()
    .from(schema.billingEvents)
    .where(eq(schema.billingEvents.eventId, eventId));
}

describe("signatures", () => {
  it("a wrong, foreign or missing signature answers 400 and changes nothing", async () => {
    const before = await account();
    const event = subscriptionEvent(`evt_${randomUUID()}`, "past_due");
    const payload = JSON.stringify(event);
    const attempts = [
      `t=${now()},v1=${"0".repeat(64)}`,
      stripe.webhooks.generateTestHeaderString({
        payload,
        secret: "whsec_someone_else",
      }),
      // Signed for another body.
      stripe.webhooks.generateTestHeaderString({
        payload: JSON.stringify({ ...event, type: "invoice.paid" }),
        secret: SECRET,
      }),
      "none",
    ];
    for (const signature of attempts) {
      const response = await deliver(event, signature);
      expect(response.status, signature).toBe(400);
      expect((await response.json()).error.code).toBe("invalid_signature");
    }
    expect(await recorded(event.id)).toHaveLength(0);
    const after = await account();
    expect(after.status).toBe(before.status);
    expect(after.stripeSubscriptionId).toBeNull();
    expect(after.pastDueSince).toBeNull();
  });

  it("a body that is not JSON is refused the same way", async () => {
    const response = await new Client().request("/api/v1/billing/webhook", {
      method: "POST",
      headers: {
        "content-type": "text/plain",
        "stripe-signature": "t=1,v1=00",
      },
      body: "hello",
    });
    expect(response.status).toBe(400);
  });
});

describe("each event once, as Stripe holds it now", () => {
  let subscription: Stripe.Subscription;

  it("applies a signed event, and a replay of its id changes nothing", async () => {
    // Made in Stripe while its own events go nowhere: only ours arrive.
    subscription = await withoutWebhooks(() =>
      subscriptionFor(customerId, organizationId),
    );
    expect((await account()).stripeSubscriptionId).toBeNull();
    const id = `evt_${randomUUID()}`;
    const event = eventAbout(id, "customer.subscription.created", subscription);
    const first = await deliver(event);
    expect(first.status).toBe(200);
    expect(await first.json()).toMatchObject({
      received: true,
      outcome: "applied",
    });
    const applied = await account();
    expect(applied).toMatchObject({
      stripeSubscriptionId: subscription.id,
      status: "active",
      quantity: 1,
      pastDueSince: null,
    });

    // The same event again, and the same id carrying other content: both are
    // answered 200 and neither is applied.
    for (const replay of [
      event,
      eventAbout(id, "customer.subscription.updated", {
        ...subscription,
        status: "past_due",
      }),
    ]) {
      const again = await deliver(replay);
      expect(again.status).toBe(200);
      expect((await again.json()).outcome).toBe("duplicate");
    }
    expect(await account()).toMatchObject({
      stripeSubscriptionId: subscription.id,
      status: "active",
      pastDueSince: null,
    });
    expect(await recorded(id)).toHaveLength(1);
  });

  it("an event's own copy is not trusted: a signed event saying cancelled leaves a live subscription active", async () => {
    const response = await deliver(
      eventAbout(`evt_${randomUUID()}`, "customer.subscription.updated", {
        ...subscription,
        status: "canceled",
      }),
    );
    expect(response.status).toBe(200);
    expect((await account()).status).toBe("active");
  });

  let failedInvoice: Stripe.Invoice;

  it("an older event delivered after a newer one cannot bring back a stale status; past due dates from the failed invoice", async () => {
    // A renewal-like charge fails in Stripe; its events are lost.
    const updated = await withoutWebhooks(async () => {
      await fake("/_fake/fail-next-payment", { customer: customerId });
      await sdk.subscriptionItems.update(subscription.items.data[0].id, {
        quantity: 2,
        proration_behavior: "always_invoice",
      });
      return sdk.subscriptions.retrieve(subscription.id, {
        expand: ["latest_invoice"],
      });
    });
    expect(updated.status).toBe("past_due");
    failedInvoice = updated.latest_invoice as Stripe.Invoice;
    expect(failedInvoice.status).toBe("open");
    // Some time passes before anything reaches Joulebook.
    await new Promise((r) => setTimeout(r, 1_100));

    const newer = eventAbout(
      `evt_${randomUUID()}`,
      "customer.subscription.updated",
      { ...updated, latest_invoice: failedInvoice.id },
    );
    expect((await (await deliver(newer)).json()).outcome).toBe("applied");
    const behind = await account();
    expect(behind.status).toBe("past_due");
    expect(behind.quantity).toBe(2);
    // When Stripe says the trouble began, not when Joulebook heard of it.
    const finalizedAt = failedInvoice.status_transitions.finalized_at! * 1000;
    expect(behind.pastDueSince!.getTime()).toBe(finalizedAt);
    const [received] = await recorded(newer.id);
    expect(
      Math.abs(received.receivedAt.getTime() - finalizedAt),
    ).toBeGreaterThanOrEqual(1_000);

    // The older snapshot (still active, quantity 1) arrives last.
    const older = eventAbout(
      `evt_${randomUUID()}`,
      "customer.subscription.updated",
      subscription,
      newer.created - 60,
    );
    expect((await deliver(older)).status).toBe(200);
    const after = await account();
    expect(after.status).toBe("past_due");
    expect(after.quantity).toBe(2);
    expect(after.pastDueSince).toEqual(behind.pastDueSince);
  });

  it("paying the invoice in Stripe brings it back to active and clears the date", async () => {
    await sdk.invoices.pay(failedInvoice.id);
    await fake("/_fake/flush");
    const after = await account();
    expect(after.status).toBe("active");
    expect(after.pastDueSince).toBeNull();
  });

  it("keeps invoices, and a late earlier status never undoes a later one", async () => {
    await deliver(invoiceEvent(`evt_${randomUUID()}`, "invoice.paid", "paid"));
    await deliver(
      invoiceEvent(`evt_${randomUUID()}`, "invoice.finalized", "open"),
    );
    const invoices = await db
      .select()
      .from(schema.billingInvoices)
      .where(
        eq(
          schema.billingInvoices.stripeInvoiceId,
          `in_test_${organizationId.slice(0, 8)}`,
        ),
      );
    expect(invoices).toHaveLength(1);
    expect(invoices[0]).toMatchObject({
      number: "TEST-0001",
      status: "paid",
      amountPaid: 5800,
    });
  });

  it("an event about an unknown customer is recorded and ignored", async () => {
    const id = `evt_${randomUUID()}`;
    const response = await deliver(
      subscriptionEvent(id, "active", "cus_nobody_we_know"),
    );
    expect(response.status).toBe(200);
    expect((await response.json()).outcome).toBe("ignored");
    const [row] = await recorded(id);
    expect(row.organizationId).toBeNull();
    expect((await account()).status).toBe("active");
  });

  it("an event about a subscription Stripe does not have is recorded and ignored", async () => {
    const id = `evt_${randomUUID()}`;
    const response = await deliver(subscriptionEvent(id, "past_due"));
    expect(response.status).toBe(200);
    expect((await response.json()).outcome).toBe("ignored");
    expect(await recorded(id)).toHaveLength(1);
    expect(await account()).toMatchObject({
      stripeSubscriptionId: subscription.id,
      status: "active",
    });
  });

  it("a cancelled subscription is dated by its end, and checking it later does not move the grace period", async () => {
    const cancelled = await sdk.subscriptions.cancel(subscription.id);
    await fake("/_fake/flush");
    const ended = await account();
    expect(ended.status).toBe("canceled");
    const endedAt = new Date(cancelled.ended_at! * 1000);
    expect(ended.currentPeriodEnd).toEqual(endedAt);
    const graceEnds = format(
      new Date(endedAt.getTime() + 7 * 86_400_000),
      "d MMM yyyy",
    );
    const page = await (await owner.get(`/o/${organizationId}/billing`)).text();
    expect(page).toContain("The subscription has ended.");
    expect(page).toContain(`New sites can be added until ${graceEnds}.`);
    expect(page).toContain("Subscribe with Checkout");

    const check = await owner.post(`/o/${organizationId}/billing`, {
      intent: "reconcile",
    });
    expect(check.status).toBe(200);
    expect(await check.text()).toContain(
      "The subscription has ended in Stripe",
    );
    const later = await (
      await owner.get(`/o/${organizationId}/billing`)
    ).text();
    expect(later).toContain(`New sites can be added until ${graceEnds}.`);
  });

  it("a later event about the ended subscription does not replace a new one", async () => {
    // Subscribed again; this time the webhook is lost and "Check now" finds it.
    const again = await withoutWebhooks(() =>
      subscriptionFor(customerId, organizationId),
    );
    const check = await owner.post(`/o/${organizationId}/billing`, {
      intent: "reconcile",
    });
    expect(check.status).toBe(200);
    expect(await check.text()).toContain("linked it");
    expect(await account()).toMatchObject({
      stripeSubscriptionId: again.id,
      status: "active",
    });
    const late = await deliver(
      eventAbout(`evt_${randomUUID()}`, "customer.subscription.deleted", {
        ...subscription,
        status: "canceled",
      }),
    );
    expect((await late.json()).outcome).toBe("ignored");
    expect(await account()).toMatchObject({
      stripeSubscriptionId: again.id,
      status: "active",
    });
  });
});

describe("a Checkout whose webhook was lost", () => {
  async function trialOrg() {
    const org = await createOrganization(["owner"]);
    const client = new Client();
    await client.signIn(org.members[0].email, org.members[0].password);
    expect((await client.get(`/o/${org.id}/billing`)).status).toBe(200);
    const row = await account(org.id);
    return { id: org.id, client, customer: row.stripeCustomerId };
  }

  it("reconciliation finds the customer's subscription in Stripe and links it", async () => {
    const org = await trialOrg();
    const made = await withoutWebhooks(() =>
      subscriptionFor(org.customer, org.id),
    );
    expect(await account(org.id)).toMatchObject({
      status: "trialing",
      stripeSubscriptionId: null,
    });
    const check = await org.client.post(`/o/${org.id}/billing`, {
      intent: "reconcile",
    });
    expect(check.status).toBe(200);
    expect(await check.text()).toContain(
      "Found a subscription in Stripe that had not reached Joulebook, and linked it.",
    );
    const linked = await account(org.id);
    expect(linked).toMatchObject({
      stripeSubscriptionId: made.id,
      status: "active",
      quantity: 1,
    });
    expect(linked.lastReconciledAt).not.toBeNull();
    const page = await (await org.client.get(`/o/${org.id}/billing`)).text();
    expect(page).toContain("Manage payment and invoices");
  });

  it("coming back from Checkout looks it up at once", async () => {
    const org = await trialOrg();
    const made = await withoutWebhooks(() =>
      subscriptionFor(org.customer, org.id),
    );
    const page = await (
      await org.client.get(`/o/${org.id}/billing?checkout=done`)
    ).text();
    expect(page).toContain("the paid plan has started");
    expect(await account(org.id)).toMatchObject({
      stripeSubscriptionId: made.id,
      status: "active",
    });
  });

  it("with nothing in Stripe, nothing is linked", async () => {
    const org = await trialOrg();
    const check = await org.client.post(`/o/${org.id}/billing`, {
      intent: "reconcile",
    });
    expect(check.status).toBe(200);
    expect(await check.text()).toContain(
      "There is no subscription to check yet.",
    );
    expect(await account(org.id)).toMatchObject({
      status: "trialing",
      stripeSubscriptionId: null,
    });
  });
});
