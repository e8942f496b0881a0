/**
 * The Stripe-shaped objects the fake stores: the fields of API version
 * 2026-10-28.endive that Joulebook reads, a subset of each object.
 */
export type Metadata = Record<string, string>;
export type Interval = "day" | "week" | "month" | "year";

interface Base {
  id: string;
  object: string;
  created: number;
  livemode: false;
}

export interface Customer extends Base {
  object: "customer";
  email: string | null;
  name: string | null;
  description: string | null;
  balance: number;
  currency: string | null;
  delinquent: boolean;
  metadata: Metadata;
  invoice_prefix: string;
  default_source: null;
  invoice_settings: { default_payment_method: null; footer: null };
  test_clock: null;
}

export interface Product extends Base {
  object: "product";
  active: boolean;
  name: string;
  description: string | null;
  metadata: Metadata;
  default_price: string | null;
  type: "service";
  updated: number;
}

export interface Price extends Base {
  object: "price";
  active: boolean;
  billing_scheme: "per_unit";
  currency: string;
  lookup_key: string | null;
  metadata: Metadata;
  nickname: string | null;
  product: string;
  recurring: {
    interval: Interval;
    interval_count: number;
    meter: null;
    usage_type: "licensed";
    trial_period_days: null;
  } | null;
  tax_behavior: "unspecified";
  type: "recurring" | "one_time";
  unit_amount: number;
  unit_amount_decimal: string;
}

export interface SubscriptionItem extends Base {
  object: "subscription_item";
  current_period_start: number;
  current_period_end: number;
  discounts: string[];
  metadata: Metadata;
  price: Price;
  quantity: number;
  subscription: string;
  tax_rates: [];
}

export type SubscriptionStatus =
  "trialing" | "active" | "past_due" | "canceled" | "incomplete";

export interface Subscription extends Base {
  object: "subscription";
  billing_cycle_anchor: number;
  cancel_at: number | null;
  cancel_at_period_end: boolean;
  canceled_at: number | null;
  cancellation_details: {
    comment: null;
    feedback: null;
    reason: "cancellation_requested" | "payment_failed" | null;
  };
  collection_method: "charge_automatically";
  currency: string;
  customer: string;
  days_until_due: null;
  default_payment_method: null;
  description: null;
  discounts: string[];
  ended_at: number | null;
  items: ApiList<SubscriptionItem> & { total_count: number };
  latest_invoice: string | null;
  metadata: Metadata;
  pending_update: null;
  schedule: null;
  start_date: number;
  status: SubscriptionStatus;
  test_clock: null;
  trial_end: number | null;
  trial_start: number | null;
}

export interface LineItem {
  id: string;
  object: "line_item";
  amount: number;
  currency: string;
  description: string;
  discount_amounts: [];
  discountable: boolean;
  discounts: [];
  invoice: string | null;
  livemode: false;
  metadata: Metadata;
  parent: {
    type: "subscription_item_details";
    invoice_item_details: null;
    subscription_item_details: {
      invoice_item: string | null;
      proration: boolean;
      proration_details: { credited_items: null };
      subscription: string;
      subscription_item: string;
    };
  };
  period: { start: number; end: number };
  pricing: {
    type: "price_details";
    price_details: { price: string; product: string };
    unit_amount_decimal: string;
  };
  quantity: number;
  subscription: string;
  subtotal: number;
  taxes: [];
}

export type InvoiceStatus = "draft" | "open" | "paid" | "void";

export interface Invoice extends Base {
  object: "invoice";
  account_name: string;
  amount_due: number;
  amount_overpaid: number;
  amount_paid: number;
  amount_remaining: number;
  attempt_count: number;
  attempted: boolean;
  auto_advance: boolean;
  billing_reason:
    | "subscription_create"
    | "subscription_cycle"
    | "subscription_update"
    | "upcoming";
  collection_method: "charge_automatically";
  currency: string;
  customer: string;
  customer_email: string | null;
  customer_name: string | null;
  description: null;
  discounts: [];
  due_date: null;
  effective_at: number | null;
  ending_balance: number | null;
  hosted_invoice_url: string | null;
  invoice_pdf: null;
  lines: ApiList<LineItem> & { total_count: number };
  metadata: Metadata;
  next_payment_attempt: number | null;
  number: string | null;
  parent: {
    type: "subscription_details";
    quote_details: null;
    subscription_details: { metadata: Metadata; subscription: string };
  };
  period_end: number;
  period_start: number;
  starting_balance: number;
  status: InvoiceStatus;
  status_transitions: {
    finalized_at: number | null;
    marked_uncollectible_at: null;
    paid_at: number | null;
    voided_at: null;
  };
  subtotal: number;
  subtotal_excluding_tax: number;
  test_clock: null;
  total: number;
  total_excluding_tax: number;
  total_taxes: [];
  webhooks_delivered_at: number | null;
}

export interface InvoiceItem extends Base {
  object: "invoiceitem";
  amount: number;
  currency: string;
  customer: string;
  date: number;
  description: string;
  discountable: boolean;
  discounts: [];
  invoice: string | null;
  metadata: Metadata;
  parent: {
    type: "subscription_details";
    subscription_details: { subscription: string; subscription_item: string };
  };
  period: { start: number; end: number };
  pricing: {
    type: "price_details";
    price_details: { price: string; product: string };
    unit_amount_decimal: string;
  };
  proration: boolean;
  proration_details: { credited_items: null; discount_amounts: [] };
  quantity: number;
  tax_rates: [];
  test_clock: null;
}

export interface CheckoutSession extends Base {
  object: "checkout.session";
  amount_subtotal: number;
  amount_total: number;
  cancel_url: string | null;
  client_reference_id: string | null;
  currency: string;
  customer: string | null;
  customer_email: string | null;
  expires_at: number;
  invoice: string | null;
  metadata: Metadata;
  mode: "subscription";
  payment_method_types: ["card"];
  payment_status: "unpaid" | "paid" | "no_payment_required";
  status: "open" | "complete" | "expired";
  subscription: string | null;
  success_url: string;
  ui_mode: "hosted";
  url: string | null;
}

/** What a Checkout Session will subscribe to; not part of Stripe's object. */
export interface CheckoutPlan {
  price: string;
  quantity: number;
  subscriptionMetadata: Metadata;
  trialDays: number | null;
}

export interface PortalSession extends Base {
  object: "billing_portal.session";
  configuration: string;
  customer: string;
  customer_account: null;
  flow: null;
  locale: null;
  on_behalf_of: null;
  return_url: string | null;
  url: string;
}

export interface StripeEvent extends Base {
  object: "event";
  api_version: string;
  data: { object: unknown; previous_attributes?: Record<string, unknown> };
  pending_webhooks: number;
  request: { id: null; idempotency_key: null };
  type: string;
}

export interface DeliveryAttempt {
  at: string;
  url: string;
  status: number | null;
  error?: string;
}

export interface ApiList<T> {
  object: "list";
  data: T[];
  has_more: boolean;
  url: string;
}
