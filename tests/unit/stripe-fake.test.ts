/**
 * The local Stripe fake, driven by the real `stripe` SDK the app uses, with
 * its webhooks received on a local endpoint and verified by the SDK.
 */
import { mkdtempSync, rmSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  createStripeFake,
  type RunningStripeFake,
} from "../../fakes/stripe-fake";

const SECRET = "whsec_test_joulebook_fake";
const DAY = 86_400;

interface Received {
  raw: string;
  signature: string;
}

let fake: RunningStripeFake;
let stripe: Stripe;
let hookServer: Server;
const received: Received[] = [];
let hookFailures = 0;
let priceId: string;

function sdk(key: string, port = fake.port): Stripe {
  return new Stripe(key, {
    host: "127.0.0.1",
    port,
    protocol: "http",
    maxNetworkRetries: 0,
    telemetry: false,
  });
}

async function control(path: string, body?: object) {
  const response = await fetch(`${fake.url}/_fake/${path}`, {
    method: body ? "POST" : "GET",
    headers: { "content-type": "application/json" },
    body: body ? JSON.stringify(body) : undefined,
  });
  return { status: response.status, body: await response.json() };
}

/** Every delivered webhook so far, verified with the SDK. */
async function deliveredEvents(): Promise<Stripe.Event[]> {
  await control("flush", {});
  return received.map((r) =>
    stripe.webhooks.constructEvent(r.raw, r.signature, SECRET),
  );
}

const aboutObject = (events: Stripe.Event[], id: string) =>
  events.filter((e) => (e.data.object as { id?: string }).id === id);

async function newCustomer(email: string) {
  return stripe.customers.create({ email, name: email.split("@")[0] });
}

async function postForm(url: string, fields: Record<string, string>) {
  return fetch(url, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams(fields),
    redirect: "manual",
  });
}

beforeAll(async () => {
  hookServer = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      if (hookFailures > 0) {
        hookFailures -= 1;
        res.writeHead(500).end();
        return;
      }
      received.push({
        raw: Buffer.concat(chunks).toString("utf8"),
        signature: String(req.headers["stripe-signature"]),
      });
      res.writeHead(200).end();
    });
  }).listen(0, "127.0.0.1");
  await new Promise((r) => hookServer.once("listening", r));
  const hookPort = (hookServer.address() as AddressInfo).port;
  fake = await createStripeFake({
    webhookUrl: `http://127.0.0.1:${hookPort}/hooks`,
    webhookSecret: SECRET,
    retryDelaysMs: [10, 20, 40],
  }).listen(0);
  stripe = sdk("sk_test_joulebook");
  const price = await stripe.prices.create({
    currency: "eur",
    unit_amount: 1200,
    recurring: { interval: "month" },
    product_data: { name: "Metered site" },
    lookup_key: "joulebook_metered_site_monthly",
  });
  priceId = price.id;
});

afterAll(async () => {
  await fake?.close();
  await new Promise((r) => hookServer?.close(r));
});

describe("customers and prices", () => {
  it("creates, retrieves, finds by e-mail and updates a customer", async () => {
    const created = await stripe.customers.create({
      email: "ann@larchmere.example",
      name: "Ann",
      metadata: { organization_id: "org-1" },
    });
    expect(created.id).toMatch(/^cus_/);
    expect(created).toMatchObject({ object: "customer", livemode: false });
    const again = await stripe.customers.retrieve(created.id);
    expect(again).toMatchObject({
      email: "ann@larchmere.example",
      metadata: { organization_id: "org-1" },
    });
    const found = await stripe.customers.list({
      email: "ann@larchmere.example",
    });
    expect(found.data.map((c) => c.id)).toEqual([created.id]);
    const updated = await stripe.customers.update(created.id, {
      metadata: { plan: "site" },
    });
    expect(updated.metadata).toEqual({
      organization_id: "org-1",
      plan: "site",
    });
    await expect(
      stripe.customers.retrieve("cus_missing"),
    ).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      statusCode: 404,
      code: "resource_missing",
    });
  });

  it("finds the price by lookup key and keeps lookup keys unique", async () => {
    const prices = await stripe.prices.list({
      lookup_keys: ["joulebook_metered_site_monthly"],
      active: true,
    });
    expect(prices.data).toHaveLength(1);
    expect(prices.data[0]).toMatchObject({
      id: priceId,
      unit_amount: 1200,
      currency: "eur",
      recurring: { interval: "month", interval_count: 1 },
    });
    const product = await stripe.products.retrieve(
      prices.data[0].product as string,
    );
    expect(product.name).toBe("Metered site");
    await expect(
      stripe.prices.create({
        currency: "eur",
        unit_amount: 1,
        product: product.id,
        lookup_key: "joulebook_metered_site_monthly",
      }),
    ).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      param: "lookup_key",
    });
  });
});

describe("subscriptions and invoices", () => {
  it("starts a paid subscription for a quantity of sites", async () => {
    const customer = await newCustomer("bo@larchmere.example");
    const sub = await stripe.subscriptions.create({
      customer: customer.id,
      items: [{ price: priceId, quantity: 3 }],
      metadata: { organization_id: "org-2" },
    });
    const item = sub.items.data[0];
    expect(sub).toMatchObject({
      status: "active",
      customer: customer.id,
      currency: "eur",
    });
    expect(item.id).toMatch(/^si_/);
    expect(item.quantity).toBe(3);
    const days = (item.current_period_end - item.current_period_start) / DAY;
    expect(days).toBeGreaterThanOrEqual(28);
    expect(days).toBeLessThanOrEqual(31);

    const invoice = await stripe.invoices.retrieve(
      sub.latest_invoice as string,
    );
    expect(invoice).toMatchObject({
      status: "paid",
      amount_due: 3600,
      amount_paid: 3600,
      billing_reason: "subscription_create",
      parent: { subscription_details: { subscription: sub.id } },
    });
    expect(invoice.number).toMatch(/^JB-FAKE-\d{4}$/);
    expect(invoice.hosted_invoice_url).toBe(
      `${fake.url}/invoices/${invoice.id}`,
    );
    expect(invoice.lines.data[0]).toMatchObject({
      amount: 3600,
      quantity: 3,
      period: {
        start: item.current_period_start,
        end: item.current_period_end,
      },
    });
    const listed = await stripe.invoices.list({
      subscription: sub.id,
      limit: 5,
    });
    expect(listed.data.map((i) => i.id)).toEqual([invoice.id]);
    const subs = await stripe.subscriptions.list({
      customer: customer.id,
      status: "all",
    });
    expect(subs.data.map((s) => s.id)).toEqual([sub.id]);
  });

  it("prorates a quantity change and shows it in the preview", async () => {
    const customer = await newCustomer("cy@larchmere.example");
    const sub = await stripe.subscriptions.create({
      customer: customer.id,
      items: [{ price: priceId, quantity: 2 }],
    });
    await control("advance", { days: 10 });
    const item = sub.items.data[0];
    const updated = await stripe.subscriptions.update(sub.id, {
      items: [{ id: item.id, quantity: 5 }],
    });
    expect(updated.items.data[0].quantity).toBe(5);

    const pending = await stripe.invoiceItems.list({
      customer: customer.id,
      pending: true,
    });
    expect(pending.data).toHaveLength(1);
    const proration = pending.data[0];
    const { start: at, end } = proration.period;
    const share =
      (end - at) / (item.current_period_end - item.current_period_start);
    expect(proration.id).toMatch(/^ii_/);
    expect(proration.proration).toBe(true);
    expect(end).toBe(item.current_period_end);
    // Ten days into a 28–31 day month: between 18/31 and 21/28 of it remain.
    expect(share).toBeGreaterThan(0.58);
    expect(share).toBeLessThan(0.76);
    expect(proration.amount).toBe(Math.round(1200 * 3 * share));
    expect(proration.amount).toBeGreaterThan(0);
    expect(proration.amount).toBeLessThan(3600);

    const preview = await stripe.invoices.createPreview({
      customer: customer.id,
      subscription: sub.id,
    });
    expect(preview.total).toBe(5 * 1200 + proration.amount);
    expect(
      preview.lines.data.map(
        (l) => l.parent?.subscription_item_details?.proration,
      ),
    ).toEqual([false, true]);
    const hypothetical = await stripe.invoices.createPreview({
      customer: customer.id,
      subscription: sub.id,
      subscription_details: { items: [{ id: item.id, quantity: 6 }] },
    });
    expect(hypothetical.lines.data).toHaveLength(3);
    expect(hypothetical.total).toBeGreaterThan(6 * 1200 + proration.amount);
    expect(
      (await stripe.invoiceItems.list({ customer: customer.id })).data,
    ).toHaveLength(1);

    const invoiced = await stripe.subscriptions.update(sub.id, {
      items: [{ id: item.id, quantity: 4 }],
      proration_behavior: "always_invoice",
    });
    const now = await stripe.invoices.retrieve(
      invoiced.latest_invoice as string,
    );
    expect(now.billing_reason).toBe("subscription_update");
    expect(now.lines.data).toHaveLength(2);
    expect(now.status).toBe("paid");
    expect(
      (await stripe.invoiceItems.list({ customer: customer.id, pending: true }))
        .data,
    ).toHaveLength(0);
  });

  it("ends a trial when the clock passes it and invoices the first month", async () => {
    const customer = await newCustomer("di@larchmere.example");
    const sub = await stripe.subscriptions.create({
      customer: customer.id,
      items: [{ price: priceId, quantity: 1 }],
      trial_period_days: 14,
    });
    expect(sub.status).toBe("trialing");
    expect(sub.trial_end! - sub.trial_start!).toBe(14 * DAY);
    expect(sub.items.data[0].current_period_end).toBe(sub.trial_end);
    expect(
      (await stripe.invoices.list({ subscription: sub.id })).data,
    ).toHaveLength(0);
    await control("advance", { days: 15 });
    const after = await stripe.subscriptions.retrieve(sub.id, {
      expand: ["latest_invoice"],
    });
    expect(after.status).toBe("active");
    expect(after.items.data[0].current_period_start).toBe(sub.trial_end);
    expect(after.latest_invoice).toMatchObject({
      status: "paid",
      amount_paid: 1200,
      billing_reason: "subscription_cycle",
    });
  });
});

describe("idempotency", () => {
  it("replays the same request and refuses a key reused with other parameters", async () => {
    const first = await stripe.customers.create(
      { email: "ed@larchmere.example" },
      { idempotencyKey: "signup-ed" },
    );
    const second = await stripe.customers.create(
      { email: "ed@larchmere.example" },
      { idempotencyKey: "signup-ed" },
    );
    expect(second.id).toBe(first.id);
    expect(second.lastResponse.headers["idempotent-replayed"]).toBe("true");
    const found = await stripe.customers.list({
      email: "ed@larchmere.example",
    });
    expect(found.data).toHaveLength(1);
    await expect(
      stripe.customers.create(
        { email: "other@larchmere.example" },
        { idempotencyKey: "signup-ed" },
      ),
    ).rejects.toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
  });
});

describe("Checkout", () => {
  it("pays on the test page, creates the subscription and sends signed webhooks", async () => {
    const customer = await newCustomer("fay@larchmere.example");
    const session = await stripe.checkout.sessions.create({
      mode: "subscription",
      customer: customer.id,
      line_items: [{ price: priceId, quantity: 4 }],
      success_url:
        "http://127.0.0.1:9/billing/done?session_id={CHECKOUT_SESSION_ID}",
      cancel_url: "http://127.0.0.1:9/billing",
      client_reference_id: "org-7",
      subscription_data: { metadata: { organization_id: "org-7" } },
    });
    expect(session.url).toBe(`${fake.url}/checkout/${session.id}`);
    expect(session).toMatchObject({ status: "open", amount_total: 4800 });

    const html = await (await fetch(session.url!)).text();
    expect(html).toContain("Local test page");
    expect(html).toContain('value="4242 4242 4242 4242"');
    expect(html).toContain("€48.00");
    expect(html).toContain('href="http://127.0.0.1:9/billing"');
    const action = /<form method="post" action="([^"]+)"/.exec(html)![1];

    const declined = await postForm(`${fake.url}${action}`, {
      card_number: "4000 0000 0000 0002",
    });
    expect(declined.status).toBe(402);
    expect(await declined.text()).toContain("declined");
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe(
      "open",
    );
    expect(
      (await stripe.subscriptions.list({ customer: customer.id })).data,
    ).toHaveLength(0);

    const paid = await postForm(`${fake.url}${action}`, {
      card_number: "4242 4242 4242 4242",
    });
    expect(paid.status).toBe(303);
    expect(paid.headers.get("location")).toBe(
      `http://127.0.0.1:9/billing/done?session_id=${session.id}`,
    );

    const done = await stripe.checkout.sessions.retrieve(session.id);
    expect(done).toMatchObject({
      status: "complete",
      payment_status: "paid",
      customer: customer.id,
    });
    const sub = await stripe.subscriptions.retrieve(
      done.subscription as string,
    );
    expect(sub).toMatchObject({
      status: "active",
      metadata: { organization_id: "org-7" },
    });
    expect(sub.items.data[0].quantity).toBe(4);
    expect(
      await stripe.invoices.retrieve(sub.latest_invoice as string),
    ).toMatchObject({ status: "paid", amount_paid: 4800 });

    const events = await deliveredEvents();
    const types = [
      ...aboutObject(events, sub.id),
      ...aboutObject(events, session.id),
    ].map((e) => e.type);
    expect(types).toEqual([
      "customer.subscription.created",
      "checkout.session.completed",
    ]);
    const invoiceEvents = aboutObject(events, sub.latest_invoice as string).map(
      (e) => e.type,
    );
    expect(invoiceEvents).toEqual([
      "invoice.created",
      "invoice.finalized",
      "invoice.paid",
    ]);
    const completed = aboutObject(events, session.id)[0];
    expect(completed).toMatchObject({
      object: "event",
      livemode: false,
      api_version: "2026-10-28.endive",
    });
    expect(completed.id).toMatch(/^evt_/);
    expect(() =>
      stripe.webhooks.constructEvent(
        received[0].raw,
        received[0].signature,
        "whsec_wrong",
      ),
    ).toThrow();
  });

  it("refuses modes other than subscription", async () => {
    await expect(
      stripe.checkout.sessions.create({
        mode: "payment",
        line_items: [{ price: priceId, quantity: 1 }],
        success_url: "http://127.0.0.1:9/done",
      }),
    ).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      param: "mode",
    });
  });
});

describe("failed payments and the billing portal", () => {
  it("leaves a failed renewal open, then the portal pays it", async () => {
    const customer = await newCustomer("gus@larchmere.example");
    const sub = await stripe.subscriptions.create({
      customer: customer.id,
      items: [{ price: priceId, quantity: 2 }],
    });
    expect(
      (await control("fail-next-payment", { customer: customer.id })).status,
    ).toBe(200);
    await control("advance", { days: 31 });

    const renewal = await stripe.invoices.retrieve(
      (await stripe.subscriptions.retrieve(sub.id)).latest_invoice as string,
    );
    expect(renewal).toMatchObject({
      status: "open",
      amount_due: 2400,
      amount_paid: 0,
      attempt_count: 1,
    });
    expect((await stripe.subscriptions.retrieve(sub.id)).status).toBe(
      "past_due",
    );
    let events = await deliveredEvents();
    expect(aboutObject(events, renewal.id).map((e) => e.type)).toContain(
      "invoice.payment_failed",
    );
    const pastDue = aboutObject(events, sub.id).at(-1)!;
    expect(pastDue.type).toBe("customer.subscription.updated");
    expect((pastDue.data.object as Stripe.Subscription).status).toBe(
      "past_due",
    );

    const portal = await stripe.billingPortal.sessions.create({
      customer: customer.id,
      return_url: "http://127.0.0.1:9/billing",
    });
    expect(portal.url).toBe(`${fake.url}/portal/${portal.id}`);
    const html = await (await fetch(portal.url)).text();
    expect(html).toContain("past_due");
    expect(html).toContain(renewal.number!);
    expect(html).toContain('href="http://127.0.0.1:9/billing"');
    const pay = await postForm(`${fake.url}/portal/${portal.id}/actions`, {
      action: "pay_invoice",
      target: renewal.id,
    });
    expect(pay.status).toBe(303);

    expect((await stripe.invoices.retrieve(renewal.id)).status).toBe("paid");
    expect((await stripe.subscriptions.retrieve(sub.id)).status).toBe("active");
    events = await deliveredEvents();
    expect(aboutObject(events, renewal.id).at(-1)!.type).toBe("invoice.paid");
    const active = aboutObject(events, sub.id).at(-1)!;
    expect(active.data.object).toMatchObject({ status: "active" });
    expect(active.data.previous_attributes).toMatchObject({
      status: "past_due",
    });
  });

  it("cancels at period end from the portal, then ends the subscription", async () => {
    const customer = await newCustomer("hal@larchmere.example");
    const sub = await stripe.subscriptions.create({
      customer: customer.id,
      items: [{ price: priceId }],
    });
    const portal = await stripe.billingPortal.sessions.create({
      customer: customer.id,
    });
    await postForm(`${fake.url}/portal/${portal.id}/actions`, {
      action: "cancel_at_period_end",
      target: sub.id,
    });
    const pending = await stripe.subscriptions.retrieve(sub.id);
    expect(pending).toMatchObject({
      status: "active",
      cancel_at_period_end: true,
    });
    expect(pending.cancel_at).toBe(pending.items.data[0].current_period_end);
    await control("advance", { days: 32 });
    const ended = await stripe.subscriptions.retrieve(sub.id);
    expect(ended.status).toBe("canceled");
    expect(ended.ended_at).toBe(pending.cancel_at);
    const events = await deliveredEvents();
    expect(aboutObject(events, sub.id).at(-1)!.type).toBe(
      "customer.subscription.deleted",
    );
    expect(
      (await stripe.invoices.list({ subscription: sub.id })).data,
    ).toHaveLength(1);
  });
});

describe("errors the SDK must see as errors", () => {
  it("answers an unimplemented route with an invalid-request error", async () => {
    await expect(stripe.balance.retrieve()).rejects.toBeInstanceOf(
      Stripe.errors.StripeInvalidRequestError,
    );
    await expect(
      stripe.refunds.create({ charge: "ch_1" }),
    ).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      statusCode: 404,
    });
  });

  it("names an unknown or invalid parameter", async () => {
    const customer = await newCustomer("ivy@larchmere.example");
    await expect(
      stripe.subscriptions.create({
        customer: customer.id,
        items: [{ price: priceId }],
        coupon: "X",
      } as Stripe.SubscriptionCreateParams),
    ).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      param: "coupon",
    });
    await expect(
      stripe.subscriptions.create({
        customer: customer.id,
        items: [{ price: priceId, quantity: 0 }],
      }),
    ).rejects.toMatchObject({ param: "items[0][quantity]" });
    await expect(
      stripe.subscriptions.create({
        customer: customer.id,
      } as Stripe.SubscriptionCreateParams),
    ).rejects.toMatchObject({ code: "parameter_missing", param: "items" });
    await expect(
      stripe.subscriptions.create({
        customer: "cus_nobody",
        items: [{ price: priceId }],
      }),
    ).rejects.toMatchObject({
      statusCode: 404,
      param: "customer",
    });
  });

  it("refuses a missing or live key", async () => {
    await expect(sdk("sk_live_real").customers.list()).rejects.toBeInstanceOf(
      Stripe.errors.StripeAuthenticationError,
    );
    const response = await fetch(`${fake.url}/v1/customers`);
    expect(response.status).toBe(401);
    expect((await response.json()).error.type).toBe("invalid_request_error");
  });
});

describe("webhook delivery and state", () => {
  it("retries a failed delivery and logs each attempt", async () => {
    hookFailures = 1;
    const customer = await newCustomer("jo@larchmere.example");
    await control("flush", {});
    const { body } = await control("events");
    const created = (
      body.data as Array<{
        type: string;
        data: { object: { id: string } };
        delivery_attempts: { status: number }[];
      }>
    ).find(
      (e) => e.type === "customer.created" && e.data.object.id === customer.id,
    )!;
    expect(created.delivery_attempts.map((a) => a.status)).toEqual([500, 200]);
  });

  it("keeps its objects in the state file across a restart", async () => {
    const dir = mkdtempSync(join(tmpdir(), "stripe-fake-"));
    try {
      const stateFile = join(dir, "stripe.json");
      const first = await createStripeFake({ stateFile }).listen(0);
      const customer = await sdk("sk_test_a", first.port).customers.create({
        email: "kit@larchmere.example",
      });
      await first.close();
      const second = await createStripeFake({ stateFile }).listen(0);
      const again = await sdk("sk_test_a", second.port).customers.retrieve(
        customer.id,
      );
      expect(again).toMatchObject({ email: "kit@larchmere.example" });
      await second.close();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
