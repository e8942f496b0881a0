/**
 * Constructors for the Stripe-shaped objects the fake stores, and the few
 * display helpers its pages and line descriptions share.
 */
import type { Ctx } from "./context";
import {
  newId,
  type Customer,
  type Interval,
  type InvoiceItem,
  type LineItem,
  type Metadata,
  type Price,
  type Product,
  type Subscription,
} from "./store";

const ZERO_DECIMAL = new Set(["jpy", "krw", "vnd", "clp", "isk", "ugx"]);

export function money(amount: number, currency: string): string {
  const divisor = ZERO_DECIMAL.has(currency) ? 1 : 100;
  return new Intl.NumberFormat("en-GB", {
    style: "currency",
    currency: currency.toUpperCase(),
  }).format(amount / divisor);
}

export function day(unix: number): string {
  return new Date(unix * 1000).toISOString().slice(0, 10);
}

export function productName(ctx: Ctx, productId: string): string {
  return ctx.state.products.find((p) => p.id === productId)?.name ?? productId;
}

export function newCustomer(
  ctx: Ctx,
  fields: {
    email?: string;
    name?: string;
    description?: string;
    metadata: Metadata;
  },
): Customer {
  return {
    id: newId("cus"),
    object: "customer",
    created: ctx.now(),
    livemode: false,
    email: fields.email ?? null,
    name: fields.name ?? null,
    description: fields.description ?? null,
    balance: 0,
    currency: null,
    delinquent: false,
    metadata: fields.metadata,
    invoice_prefix: "JB-FAKE",
    default_source: null,
    invoice_settings: { default_payment_method: null, footer: null },
    test_clock: null,
  };
}

export function newProduct(
  ctx: Ctx,
  fields: {
    name: string;
    description?: string;
    active?: boolean;
    metadata: Metadata;
  },
): Product {
  const now = ctx.now();
  return {
    id: newId("prod"),
    object: "product",
    created: now,
    updated: now,
    livemode: false,
    active: fields.active ?? true,
    name: fields.name,
    description: fields.description ?? null,
    metadata: fields.metadata,
    default_price: null,
    type: "service",
  };
}

export function newPrice(
  ctx: Ctx,
  fields: Pick<Price, "currency" | "unit_amount" | "product" | "metadata"> & {
    recurring?: { interval: Interval; interval_count?: number };
    lookup_key?: string;
    nickname?: string;
    active?: boolean;
  },
): Price {
  return {
    id: newId("price"),
    object: "price",
    created: ctx.now(),
    livemode: false,
    active: fields.active ?? true,
    billing_scheme: "per_unit",
    currency: fields.currency,
    lookup_key: fields.lookup_key ?? null,
    metadata: fields.metadata,
    nickname: fields.nickname ?? null,
    product: fields.product,
    recurring: fields.recurring
      ? {
          interval: fields.recurring.interval,
          interval_count: fields.recurring.interval_count ?? 1,
          meter: null,
          usage_type: "licensed",
          trial_period_days: null,
        }
      : null,
    tax_behavior: "unspecified",
    type: fields.recurring ? "recurring" : "one_time",
    unit_amount: fields.unit_amount,
    unit_amount_decimal: String(fields.unit_amount),
  };
}

export function newSubscription(
  ctx: Ctx,
  fields: {
    customer: string;
    price: Price;
    quantity: number;
    metadata: Metadata;
    periodEnd: number;
    trialEnd: number | null;
  },
): Subscription {
  const now = ctx.now();
  const id = newId("sub");
  return {
    id,
    object: "subscription",
    created: now,
    livemode: false,
    billing_cycle_anchor: fields.trialEnd ?? now,
    cancel_at: null,
    cancel_at_period_end: false,
    canceled_at: null,
    cancellation_details: { comment: null, feedback: null, reason: null },
    collection_method: "charge_automatically",
    currency: fields.price.currency,
    customer: fields.customer,
    days_until_due: null,
    default_payment_method: null,
    description: null,
    discounts: [],
    ended_at: null,
    items: {
      object: "list",
      data: [
        {
          id: newId("si"),
          object: "subscription_item",
          created: now,
          livemode: false,
          current_period_start: now,
          current_period_end: fields.periodEnd,
          discounts: [],
          metadata: {},
          price: structuredClone(fields.price),
          quantity: fields.quantity,
          subscription: id,
          tax_rates: [],
        },
      ],
      has_more: false,
      total_count: 1,
      url: `/v1/subscription_items?subscription=${id}`,
    },
    latest_invoice: null,
    metadata: fields.metadata,
    pending_update: null,
    schedule: null,
    start_date: now,
    status: fields.trialEnd ? "trialing" : "incomplete",
    test_clock: null,
    trial_end: fields.trialEnd,
    trial_start: fields.trialEnd ? now : null,
  };
}

/** A line before it belongs to an invoice (also used for previews). */
export interface LineDraft {
  amount: number;
  quantity: number;
  period: { start: number; end: number };
  description: string;
  proration: boolean;
  invoiceItem: string | null;
}

export function toLine(
  draft: LineDraft,
  sub: Subscription,
  invoiceId: string | null,
): LineItem {
  const item = sub.items.data[0];
  return {
    id: newId("il"),
    object: "line_item",
    amount: draft.amount,
    currency: sub.currency,
    description: draft.description,
    discount_amounts: [],
    discountable: !draft.proration,
    discounts: [],
    invoice: invoiceId,
    livemode: false,
    metadata: {},
    parent: {
      type: "subscription_item_details",
      invoice_item_details: null,
      subscription_item_details: {
        invoice_item: draft.invoiceItem,
        proration: draft.proration,
        proration_details: { credited_items: null },
        subscription: sub.id,
        subscription_item: item.id,
      },
    },
    period: draft.period,
    pricing: {
      type: "price_details",
      price_details: { price: item.price.id, product: item.price.product },
      unit_amount_decimal: item.price.unit_amount_decimal,
    },
    quantity: draft.quantity,
    subscription: sub.id,
    subtotal: draft.amount,
    taxes: [],
  };
}

export function newInvoiceItem(
  ctx: Ctx,
  sub: Subscription,
  draft: LineDraft,
): InvoiceItem {
  const item = sub.items.data[0];
  return {
    id: newId("ii"),
    object: "invoiceitem",
    created: ctx.now(),
    livemode: false,
    amount: draft.amount,
    currency: sub.currency,
    customer: sub.customer,
    date: ctx.now(),
    description: draft.description,
    discountable: false,
    discounts: [],
    invoice: null,
    metadata: {},
    parent: {
      type: "subscription_details",
      subscription_details: {
        subscription: sub.id,
        subscription_item: item.id,
      },
    },
    period: draft.period,
    pricing: {
      type: "price_details",
      price_details: { price: item.price.id, product: item.price.product },
      unit_amount_decimal: item.price.unit_amount_decimal,
    },
    proration: draft.proration,
    proration_details: { credited_items: null, discount_amounts: [] },
    quantity: draft.quantity,
    tax_rates: [],
    test_clock: null,
  };
}
