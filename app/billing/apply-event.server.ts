/**
 * Applies one verified Stripe event. The event's id is inserted into
 * billing_events in the same transaction as its effect, so an event is
 * applied exactly once however often Stripe delivers it. Subscription and
 * Checkout events store the subscription as Stripe holds it now
 * (live-subscription.server.ts), so their order of arrival does not matter.
 */
import { and, eq } from "drizzle-orm";
import type Stripe from "stripe";
import { recordAudit } from "~/audit/record-audit.server";
import { db, type Transaction } from "~/db/client.server";
import { billingEvents, billingInvoices } from "~/db/schema";
import type { BillingAccount } from "./account.server";
import { supersedes } from "./invoice-status";
import {
  lockAccountByCustomer,
  mirrorSubscription,
} from "./live-subscription.server";
import { BEHIND_STATUSES, idOf, invoiceSnapshot } from "./stripe-objects";

export type EventOutcome = "applied" | "duplicate" | "ignored";

export interface EventResult {
  outcome: EventOutcome;
  /** Set when the event linked a subscription the account did not have. */
  linked?: { organizationId: string; subscriptionId: string };
}

const SUBSCRIPTION_EVENTS = new Set([
  "customer.subscription.created",
  "customer.subscription.updated",
  "customer.subscription.deleted",
  "customer.subscription.paused",
  "customer.subscription.resumed",
]);

/** The Stripe customer an event is about, if it is one we act on. */
function customerOf(event: Stripe.Event): string | null {
  const object = event.data.object as { customer?: unknown };
  const handled =
    event.type === "checkout.session.completed" ||
    SUBSCRIPTION_EVENTS.has(event.type) ||
    event.type.startsWith("invoice.");
  if (!handled) return null;
  return idOf(object.customer as string | { id: string } | null);
}

/** The subscription a Checkout or subscription event is about. */
function subscriptionOf(event: Stripe.Event): string | null {
  if (event.type === "checkout.session.completed") {
    const session = event.data.object;
    if (session.mode !== "subscription") return null;
    return idOf(session.subscription);
  }
  if (SUBSCRIPTION_EVENTS.has(event.type))
    return (event.data.object as Stripe.Subscription).id ?? null;
  return null;
}

/** The event's time, if its own copy already showed the subscription behind. */
function behindAt(event: Stripe.Event): Date | null {
  if (!SUBSCRIPTION_EVENTS.has(event.type)) return null;
  const status = (event.data.object as Stripe.Subscription).status;
  return BEHIND_STATUSES.has(status) ? new Date(event.created * 1000) : null;
}

async function applySubscription(
  tx: Transaction,
  account: BillingAccount,
  event: Stripe.Event,
  subscriptionId: string,
): Promise<EventResult> {
  if (event.type === "checkout.session.completed") {
    const session = event.data.object;
    const reference = session.client_reference_id;
    if (reference && reference !== account.organizationId) {
      console.warn(
        `[billing] checkout ${session.id} names organisation ${reference} but its customer belongs to ${account.organizationId}; linked by customer`,
      );
    }
  }
  const result = await mirrorSubscription(tx, account, subscriptionId, {
    cause: `Stripe event ${event.type}`,
    eventBehindAt: behindAt(event),
  });
  if (!result.stored) return { outcome: "ignored" };
  return {
    outcome: "applied",
    ...(result.linked
      ? {
          linked: {
            organizationId: account.organizationId,
            subscriptionId,
          },
        }
      : {}),
  };
}

async function applyInvoice(
  tx: Transaction,
  account: BillingAccount,
  invoice: Stripe.Invoice,
  eventType: string,
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
  if (existing?.status !== row.status)
    await recordAudit(tx, {
      organizationId: account.organizationId,
      actorUserId: null,
      action: "billing.invoice_changed",
      subject: row.stripeInvoiceId,
      reason: `Stripe event ${eventType}`,
      before: existing ? { invoiceStatus: existing.status } : null,
      after: { invoiceStatus: row.status },
      details: {
        number: row.number,
        currency: row.currency,
        amountDue: row.amountDue,
        amountPaid: row.amountPaid,
      },
    });
  return true;
}

async function applyEffect(
  tx: Transaction,
  account: BillingAccount,
  event: Stripe.Event,
): Promise<EventResult> {
  const subscriptionId = subscriptionOf(event);
  if (subscriptionId)
    return applySubscription(tx, account, event, subscriptionId);
  if (event.type.startsWith("invoice.")) {
    const applied = await applyInvoice(
      tx,
      account,
      event.data.object as Stripe.Invoice,
      event.type,
    );
    return { outcome: applied ? "applied" : "ignored" };
  }
  return { outcome: "ignored" };
}

/** Applies the event once; answers only after the commit. */
export async function applyStripeEvent(
  event: Stripe.Event,
): Promise<EventResult> {
  return db.transaction(async (tx) => {
    const customerId = customerOf(event);
    const account = customerId
      ? await lockAccountByCustomer(tx, customerId)
      : null;
    const [fresh] = await tx
      .insert(billingEvents)
      .values({
        eventId: event.id,
        type: event.type,
        organizationId: account?.organizationId ?? null,
      })
      .onConflictDoNothing()
      .returning({ eventId: billingEvents.eventId });
    if (!fresh) return { outcome: "duplicate" };
    if (!account) return { outcome: "ignored" };
    return applyEffect(tx, account, event);
  });
}
