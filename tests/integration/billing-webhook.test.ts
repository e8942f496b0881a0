/**
 * POST /api/v1/billing/webhook: signatures over the raw body, each event
 * applied once, unknown customers recorded and ignored.
 */
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";

const SECRET = "whsec_test_joulebook_fake";
const LOOKUP_KEY = "joulebook_metered_site_monthly";
const stripe = new Stripe("sk_test_joulebook", { telemetry: false });
const now = () => Math.floor(Date.now() / 1000);

afterAll(() => pool.end());

let organizationId: string;
let customerId: string;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  const org = await createOrganization(["owner"]);
  organizationId = org.id;
  const owner = new Client();
  await owner.signIn(org.members[0].email, org.members[0].password);
  // The first visit opens the account: a Stripe customer and the trial.
  expect((await owner.get(`/o/${org.id}/billing`)).status).toBe(200);
  customerId = (await account()).stripeCustomerId;
});

async function account() {
  const [row] = await db
    .select()
    .from(schema.billingAccounts)
    .where(eq(schema.billingAccounts.organizationId, organizationId));
  return row;
}

function subscriptionEvent(
  id: string,
  status: string,
  customer = customerId,
  quantity = 3,
) {
  return {
    id,
    object: "event",
    api_version: "2026-10-28.endive",
    created: now(),
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type: "customer.subscription.updated",
    data: {
      object: {
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
      },
    },
  };
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

describe("each event once", () => {
  it("applies a signed event, and a replay of its id changes nothing", async () => {
    const id = `evt_${randomUUID()}`;
    const first = await deliver(subscriptionEvent(id, "past_due"));
    expect(first.status).toBe(200);
    expect(await first.json()).toMatchObject({
      received: true,
      outcome: "applied",
    });
    const applied = await account();
    expect(applied.status).toBe("past_due");
    expect(applied.quantity).toBe(3);
    expect(applied.stripeSubscriptionId).toBe(
      `sub_test_${organizationId.slice(0, 8)}`,
    );
    expect(applied.pastDueSince).not.toBeNull();

    // The same event again, and the same id carrying other content: both are
    // answered 200 and neither is applied.
    for (const replay of [
      subscriptionEvent(id, "past_due"),
      subscriptionEvent(id, "active", customerId, 7),
    ]) {
      const again = await deliver(replay);
      expect(again.status).toBe(200);
      expect((await again.json()).outcome).toBe("duplicate");
    }
    const after = await account();
    expect(after.status).toBe("past_due");
    expect(after.quantity).toBe(3);
    expect(after.pastDueSince).toEqual(applied.pastDueSince);
    expect(await recorded(id)).toHaveLength(1);
  });

  it("leaving past due clears the date", async () => {
    const response = await deliver(
      subscriptionEvent(`evt_${randomUUID()}`, "active"),
    );
    expect((await response.json()).outcome).toBe("applied");
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
      .where(eq(schema.billingInvoices.organizationId, organizationId));
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
});
