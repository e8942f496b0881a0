import type Stripe from "stripe";
import { describe, expect, it } from "vitest";
import {
  idOf,
  invoiceSnapshot,
  siteItem,
  subscriptionSnapshot,
  subscriptionToFollow,
  troubleStart,
} from "./stripe-objects";

const subscription = {
  id: "sub_1",
  object: "subscription",
  customer: "cus_1",
  status: "active",
  cancel_at_period_end: true,
  metadata: { organization_id: "org-1" },
  items: {
    object: "list",
    data: [
      {
        id: "si_other",
        quantity: 9,
        current_period_end: 1_700_000_000,
        price: { lookup_key: "something_else" },
      },
      {
        id: "si_sites",
        quantity: 3,
        current_period_end: 1_800_000_000,
        price: { lookup_key: "sites_monthly" },
      },
    ],
  },
} as unknown as Stripe.Subscription;

describe("reading Stripe objects", () => {
  it("takes ids from strings or expanded objects", () => {
    expect(idOf("cus_1")).toBe("cus_1");
    expect(idOf({ id: "cus_2" })).toBe("cus_2");
    expect(idOf(null)).toBeNull();
  });

  it("finds the metered-site item by the price's lookup key", () => {
    expect(siteItem(subscription, "sites_monthly")?.id).toBe("si_sites");
    expect(siteItem(subscription, "missing")?.id).toBe("si_other");
  });

  it("reads quantity and period end from the item", () => {
    expect(subscriptionSnapshot(subscription, "sites_monthly")).toEqual({
      subscriptionId: "sub_1",
      customerId: "cus_1",
      organizationId: "org-1",
      status: "active",
      quantity: 3,
      currentPeriodEnd: new Date(1_800_000_000 * 1000),
      cancelAtPeriodEnd: true,
    });
  });

  it("finds an invoice's subscription under parent.subscription_details", () => {
    const invoice = {
      id: "in_1",
      customer: { id: "cus_1" },
      parent: {
        type: "subscription_details",
        subscription_details: { subscription: "sub_1", metadata: null },
      },
      number: "JB-0001",
      status: "paid",
      currency: "gbp",
      amount_due: 5800,
      amount_paid: 5800,
      period_start: 1_700_000_000,
      period_end: 1_702_592_000,
      hosted_invoice_url: "http://127.0.0.1:1/i/in_1",
      created: 1_700_000_100,
    } as unknown as Stripe.Invoice;
    expect(invoiceSnapshot(invoice)).toMatchObject({
      stripeInvoiceId: "in_1",
      customerId: "cus_1",
      subscriptionId: "sub_1",
      status: "paid",
      amountDue: 5800,
      createdAt: new Date(1_700_000_100 * 1000),
    });
  });

  it("takes the billed period from the lines, not the invoice's own period", () => {
    // Stripe's invoice.period_* is the period just ended; a first invoice has
    // both equal to its creation time. The lines carry the service period.
    const invoice = {
      id: "in_2",
      customer: "cus_1",
      status: "paid",
      currency: "gbp",
      amount_due: 2900,
      amount_paid: 2900,
      period_start: 1_700_000_000,
      period_end: 1_700_000_000,
      created: 1_700_000_000,
      lines: {
        data: [
          { period: { start: 1_700_000_000, end: 1_702_592_000 } },
          { period: { start: 1_701_000_000, end: 1_702_592_000 } },
        ],
      },
    } as unknown as Stripe.Invoice;
    expect(invoiceSnapshot(invoice)).toMatchObject({
      periodStart: new Date(1_700_000_000 * 1000),
      periodEnd: new Date(1_702_592_000 * 1000),
    });
  });
});

describe("an ended subscription", () => {
  it("is dated by when it ended, not by the period it was cut short in", () => {
    const ended = {
      ...subscription,
      status: "canceled",
      ended_at: 1_750_000_000,
      canceled_at: 1_749_000_000,
    } as unknown as Stripe.Subscription;
    expect(
      subscriptionSnapshot(ended, "sites_monthly").currentPeriodEnd,
    ).toEqual(new Date(1_750_000_000 * 1000));
    // A live one keeps its item's period end.
    expect(
      subscriptionSnapshot(subscription, "sites_monthly").currentPeriodEnd,
    ).toEqual(new Date(1_800_000_000 * 1000));
  });
});

describe("when payment trouble began", () => {
  const now = new Date(1_760_000_000 * 1000);
  const eventAt = new Date(1_759_000_000 * 1000);
  const withInvoice = (invoice: unknown) =>
    ({
      ...subscription,
      status: "past_due",
      latest_invoice: invoice,
    }) as unknown as Stripe.Subscription;

  it("is when the unpaid invoice was finalized (its first charge)", () => {
    const sub = withInvoice({
      id: "in_1",
      status: "open",
      created: 1_700_000_000,
      due_date: null,
      status_transitions: { finalized_at: 1_700_003_600 },
    });
    expect(troubleStart(sub, eventAt, now)).toEqual(
      new Date(1_700_003_600 * 1000),
    );
  });

  it("is the due date of an invoice sent to be paid", () => {
    const sub = withInvoice({
      id: "in_1",
      status: "open",
      created: 1_700_000_000,
      due_date: 1_701_000_000,
      status_transitions: { finalized_at: 1_700_003_600 },
    });
    expect(troubleStart(sub, null, now)).toEqual(
      new Date(1_701_000_000 * 1000),
    );
  });

  it("falls back to the event's time, then to now", () => {
    const paid = withInvoice({
      id: "in_1",
      status: "paid",
      created: 1_700_000_000,
      status_transitions: { finalized_at: 1_700_000_000 },
    });
    expect(troubleStart(paid, eventAt, now)).toEqual(eventAt);
    expect(troubleStart(withInvoice("in_1"), eventAt, now)).toEqual(eventAt);
    expect(troubleStart(withInvoice(null), null, now)).toEqual(now);
  });
});

describe("the subscription to follow", () => {
  const billing = new Set(["active", "past_due", "trialing"]);
  const list = [
    { id: "sub_new", status: "active" },
    { id: "sub_old", status: "past_due" },
    { id: "sub_gone", status: "canceled" },
  ] as const;

  it("keeps the linked one while it bills", () => {
    expect(subscriptionToFollow([...list], "sub_old", billing)).toEqual({
      follow: "sub_old",
      others: ["sub_new"],
    });
  });

  it("otherwise takes the newest that bills", () => {
    expect(subscriptionToFollow([...list], "sub_gone", billing).follow).toBe(
      "sub_new",
    );
    expect(subscriptionToFollow([...list], null, billing).follow).toBe(
      "sub_new",
    );
  });

  it("finds none when nothing bills", () => {
    expect(subscriptionToFollow([list[2]], "sub_gone", billing)).toEqual({
      follow: null,
      others: [],
    });
  });
});
