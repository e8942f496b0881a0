/**
 * The parts of Stripe's objects that Joulebook keeps, read the way the pinned
 * API version shapes them: periods sit on subscription items, and an invoice
 * names its subscription under parent.subscription_details.
 */
import type Stripe from "stripe";

type Ref = string | { id: string } | null | undefined;

/** Stripe sends a related object as its id, or expanded: either way, the id. */
export function idOf(ref: Ref): string | null {
  if (!ref) return null;
  return typeof ref === "string" ? ref : ref.id;
}

const fromUnix = (seconds: number | null | undefined) =>
  typeof seconds === "number" ? new Date(seconds * 1000) : null;

/** The item that carries the metered-site price (the first one otherwise). */
export function siteItem(
  subscription: Stripe.Subscription,
  lookupKey: string,
): Stripe.SubscriptionItem | null {
  const items = subscription.items?.data ?? [];
  return (
    items.find((item) => item.price?.lookup_key === lookupKey) ??
    items[0] ??
    null
  );
}

export interface SubscriptionSnapshot {
  subscriptionId: string;
  customerId: string | null;
  organizationId: string | null;
  status: string;
  quantity: number;
  currentPeriodEnd: Date | null;
  cancelAtPeriodEnd: boolean;
}

export function subscriptionSnapshot(
  subscription: Stripe.Subscription,
  lookupKey: string,
): SubscriptionSnapshot {
  const item = siteItem(subscription, lookupKey);
  return {
    subscriptionId: subscription.id,
    customerId: idOf(subscription.customer),
    organizationId: subscription.metadata?.organization_id ?? null,
    status: subscription.status,
    quantity: item?.quantity ?? 0,
    currentPeriodEnd: fromUnix(item?.current_period_end),
    cancelAtPeriodEnd: Boolean(subscription.cancel_at_period_end),
  };
}

export interface InvoiceSnapshot {
  stripeInvoiceId: string;
  customerId: string | null;
  subscriptionId: string | null;
  number: string | null;
  status: string;
  currency: string;
  amountDue: number;
  amountPaid: number;
  periodStart: Date | null;
  periodEnd: Date | null;
  hostedInvoiceUrl: string | null;
  createdAt: Date;
}

/**
 * The service period an invoice bills. Stripe's invoice-level period_start/end
 * is the period that just ended (on a first invoice both are its creation
 * time); what the customer pays for is on the lines, so take their span.
 */
function billedPeriod(invoice: Stripe.Invoice): {
  periodStart: Date | null;
  periodEnd: Date | null;
} {
  const periods = (invoice.lines?.data ?? []).map((line) => line.period);
  if (periods.length === 0)
    return {
      periodStart: fromUnix(invoice.period_start),
      periodEnd: fromUnix(invoice.period_end),
    };
  return {
    periodStart: fromUnix(Math.min(...periods.map((p) => p.start))),
    periodEnd: fromUnix(Math.max(...periods.map((p) => p.end))),
  };
}

export function invoiceSnapshot(invoice: Stripe.Invoice): InvoiceSnapshot {
  return {
    stripeInvoiceId: invoice.id ?? "",
    customerId: idOf(invoice.customer),
    subscriptionId: idOf(
      invoice.parent?.subscription_details?.subscription ?? null,
    ),
    number: invoice.number ?? null,
    status: invoice.status ?? "draft",
    currency: invoice.currency,
    amountDue: invoice.amount_due ?? 0,
    amountPaid: invoice.amount_paid ?? 0,
    ...billedPeriod(invoice),
    hostedInvoiceUrl: invoice.hosted_invoice_url ?? null,
    createdAt: fromUnix(invoice.created) ?? new Date(),
  };
}
