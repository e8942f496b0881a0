import type Stripe from "stripe";
import { describe, expect, it } from "vitest";
import {
  idOf,
  invoiceSnapshot,
  siteItem,
  subscriptionSnapshot,
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
