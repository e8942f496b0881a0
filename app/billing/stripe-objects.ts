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
  /** The end of the paid period; for an ended subscription, when it ended. */
  currentPeriodEnd: Date | null;
  cancelAtPeriodEnd: boolean;
}

/** Statuses of a subscription that will never bill again. */
export const ENDED_STATUSES = new Set(["canceled", "incomplete_expired"]);

export function subscriptionSnapshot(
  subscription: Stripe.Subscription,
  lookupKey: string,
): SubscriptionSnapshot {
  const item = siteItem(subscription, lookupKey);
  // An ended subscription's item still shows the period it was cut short
  // in; the standing dates the end (and its grace period) by ended_at.
  const ended = ENDED_STATUSES.has(subscription.status)
    ? fromUnix(subscription.ended_at ?? subscription.canceled_at)
    : null;
  return {
    subscriptionId: subscription.id,
    customerId: idOf(subscription.customer),
    organizationId: subscription.metadata?.organization_id ?? null,
    status: subscription.status,
    quantity: item?.quantity ?? 0,
    currentPeriodEnd: ended ?? fromUnix(item?.current_period_end),
    cancelAtPeriodEnd: Boolean(subscription.cancel_at_period_end),
  };
}

/** Statuses in which a subscription exists but is not being paid. */
export const BEHIND_STATUSES = new Set(["past_due", "unpaid"]);
const UNPAID_INVOICE = new Set(["open", "uncollectible"]);

/**
 * When Stripe says a subscription's payment trouble began. The unpaid latest
 * invoice dates it best (its due date for invoices sent to be paid, else
 * when it was finalized, which is when the card was first charged); failing
 * that, the time of an event that already showed the subscription behind;
 * failing that, `now`. Pass the subscription with latest_invoice expanded.
 */
export function troubleStart(
  subscription: Stripe.Subscription,
  eventBehindAt: Date | null,
  now: Date,
): Date {
  const invoice = subscription.latest_invoice;
  if (
    invoice &&
    typeof invoice === "object" &&
    UNPAID_INVOICE.has(invoice.status ?? "")
  ) {
    const at = fromUnix(
      invoice.due_date ??
        invoice.status_transitions?.finalized_at ??
        invoice.created,
    );
    if (at) return at;
  }
  return eventBehindAt ?? now;
}

/**
 * The live subscription a customer's account should follow: the linked one
 * while it still bills, else the newest one that bills. `subscriptions` is
 * Stripe's list, newest first.
 */
export function subscriptionToFollow(
  subscriptions: Pick<Stripe.Subscription, "id" | "status">[],
  linkedId: string | null,
  billingStatuses: ReadonlySet<string>,
): { follow: string | null; others: string[] } {
  const live = subscriptions.filter((s) => billingStatuses.has(s.status));
  const chosen = live.find((s) => s.id === linkedId) ?? live[0] ?? null;
  return {
    follow: chosen?.id ?? null,
    others: live.filter((s) => s !== chosen).map((s) => s.id),
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
