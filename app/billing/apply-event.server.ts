/**
 * Applies one verified Stripe event. The event's id is inserted into
 * billing_events in the same transaction as its effect, so an event is
 * applied exactly once however often Stripe delivers it.
 */
import { and, eq } from "drizzle-orm";
import type Stripe from "stripe";
import { db, type Transaction } from "~/db/client.server";
import { billingAccounts, billingEvents, billingInvoices } from "~/db/schema";
import { env } from "~/env.server";
import type { BillingAccount } from "./account.server";
import { nextPastDueSince } from "./standing";
import {
  idOf,
  invoiceSnapshot,
  subscriptionSnapshot,
  type SubscriptionSnapshot,
} from "./stripe-objects";
import { supersedes } from "./invoice-status";

export type EventOutcome = "applied" | "duplicate" | "ignored";

/** The Stripe customer an event is about, if it is one we act on. */
function customerOf(event: Stripe.Event): string | null {
  const object = event.data.object as { customer?: unknown };
  const handled =
    event.type === "checkout.session.completed" ||
    event.type.startsWith("customer.subscription.") ||
    event.type.startsWith("invoice.");
  if (!handled) return null;
  return idOf(object.customer as string | { id: string } | null);
}

async function lockAccount(
  tx: Transaction,
  customerId: string | null,
): Promise<BillingAccount | null> {
  if (!customerId) return null;
  const [account] = await tx
    .select()
    .from(billingAccounts)
    .where(eq(billingAccounts.stripeCustomerId, customerId))
    .for("update");
  return account ?? null;
}

async function linkCheckout(
  tx: Transaction,
  account: BillingAccount,
  session: Stripe.Checkout.Session,
): Promise<void> {
  const subscriptionId = idOf(session.subscription);
  if (session.mode !== "subscription" || !subscriptionId) return;
  const reference = session.client_reference_id;
  if (reference && reference !== account.organizationId) {
    console.warn(
      `[billing] checkout ${session.id} names organisation ${reference} but its customer belongs to ${account.organizationId}; linked by customer`,
    );
  }
  if (account.stripeSubscriptionId === subscriptionId) return;
  // The subscription's own events carry its exact status; until one arrives
  // a paid Checkout means the plan is running.
  await tx
    .update(billingAccounts)
    .set({
      stripeSubscriptionId: subscriptionId,
      status: session.payment_status === "paid" ? "active" : "incomplete",
      pastDueSince: null,
      updatedAt: new Date(),
    })
    .where(eq(billingAccounts.organizationId, account.organizationId));
}

const ENDED = new Set(["canceled", "incomplete_expired"]);

/** An event about another subscription than the live one is history, not news. */
function concernsLinkedSubscription(
  account: BillingAccount,
  snapshot: SubscriptionSnapshot,
): boolean {
  return (
    !account.stripeSubscriptionId ||
    account.stripeSubscriptionId === snapshot.subscriptionId ||
    ENDED.has(account.status)
  );
}

async function applySubscription(
  tx: Transaction,
  account: BillingAccount,
  event: Stripe.Event,
): Promise<boolean> {
  const snapshot = subscriptionSnapshot(
    event.data.object as Stripe.Subscription,
    env().STRIPE_PRICE_LOOKUP_KEY,
  );
  if (!concernsLinkedSubscription(account, snapshot)) return false;
  const status =
    event.type === "customer.subscription.deleted"
      ? "canceled"
      : snapshot.status;
  const now = new Date();
  await tx
    .update(billingAccounts)
    .set({
      stripeSubscriptionId: snapshot.subscriptionId,
      status,
      quantity: snapshot.quantity,
      currentPeriodEnd: snapshot.currentPeriodEnd,
      cancelAtPeriodEnd: snapshot.cancelAtPeriodEnd,
      pastDueSince: nextPastDueSince(status, account.pastDueSince, now),
      updatedAt: now,
    })
    .where(eq(billingAccounts.organizationId, account.organizationId));
  return true;
}

async function applyInvoice(
  tx: Transaction,
  account: BillingAccount,
  invoice: Stripe.Invoice,
): Promise<boolean> {
  const {
    customerId: _c,
    subscriptionId: _s,
    ...row
  } = invoiceSnapshot(invoice);
  if (!row.stripeInvoiceId) return false;
  const [existing] = await tx
    .select({ status: billingInvoices.status })
    .from(billingInvoices)
    .where(
      and(
        eq(billingInvoices.organizationId, account.organizationId),
        eq(billingInvoices.stripeInvoiceId, row.stripeInvoiceId),
      ),
    );
  // A late snapshot of an earlier state is recorded as received, not applied.
  if (!supersedes(existing?.status ?? null, row.status)) return false;
  const values = { ...row, organizationId: account.organizationId };
  await tx
    .insert(billingInvoices)
    .values(values)
    .onConflictDoUpdate({
      target: [billingInvoices.organizationId, billingInvoices.stripeInvoiceId],
      set: values,
    });
  return true;
}

async function applyEffect(
  tx: Transaction,
  account: BillingAccount,
  event: Stripe.Event,
): Promise<boolean> {
  if (event.type === "checkout.session.completed") {
    await linkCheckout(tx, account, event.data.object);
    return true;
  }
  if (
    event.type === "customer.subscription.created" ||
    event.type === "customer.subscription.updated" ||
    event.type === "customer.subscription.deleted"
  ) {
    return applySubscription(tx, account, event);
  }
  if (event.type.startsWith("invoice.")) {
    return applyInvoice(tx, account, event.data.object as Stripe.Invoice);
  }
  return false;
}

/** Applies the event once; answers only after the commit. */
export async function applyStripeEvent(
  event: Stripe.Event,
): Promise<EventOutcome> {
  return db.transaction(async (tx) => {
    const account = await lockAccount(tx, customerOf(event));
    const [fresh] = await tx
      .insert(billingEvents)
      .values({
        eventId: event.id,
        type: event.type,
        organizationId: account?.organizationId ?? null,
      })
      .onConflictDoNothing()
      .returning({ eventId: billingEvents.eventId });
    if (!fresh) return "duplicate";
    if (!account) return "ignored";
    return (await applyEffect(tx, account, event)) ? "applied" : "ignored";
  });
}
