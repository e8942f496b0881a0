/**
 * The subscription as Stripe holds it now, mirrored onto the billing account.
 * Webhook events arrive late, twice or out of order, so an event is only a
 * cue: the subscription is read from Stripe and that live state is stored,
 * whatever the event's own copy says (Stripe's advice for ordering).
 *
 * The account row stays locked (SELECT … FOR UPDATE) from before the read
 * until the write commits, so two deliveries, or a delivery and a
 * reconciliation, store their reads in the order they made them: a slower,
 * older read cannot overwrite a newer one. The read is short and not retried
 * here; Stripe redelivers a failed event and the timer reconciles again.
 */
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import type { Transaction } from "~/db/client.server";
import { billingAccounts } from "~/db/schema";
import { env } from "~/env.server";
import {
  BILLING_STATUSES,
  hasLiveSubscription,
  type BillingAccount,
} from "./account.server";
import { recordBillingChange } from "./billing-audit.server";
import { nextPastDueSince } from "./standing";
import {
  subscriptionSnapshot,
  troubleStart,
  type SubscriptionSnapshot,
} from "./stripe-objects";
import { stripe } from "./stripe.server";

/** For reads made while a lock is held or a person waits. */
export const SHORT_READ = { timeout: 10_000, maxNetworkRetries: 0 } as const;

/** The subscription with its latest invoice, or null if Stripe has no such object. */
export async function retrieveLiveSubscription(
  subscriptionId: string,
): Promise<Stripe.Subscription | null> {
  try {
    return await stripe().subscriptions.retrieve(
      subscriptionId,
      { expand: ["latest_invoice"] },
      SHORT_READ,
    );
  } catch (error) {
    if (
      error instanceof Stripe.errors.StripeInvalidRequestError &&
      error.code === "resource_missing"
    )
      return null;
    throw error;
  }
}

export async function lockAccountByCustomer(
  tx: Transaction,
  customerId: string,
): Promise<BillingAccount | null> {
  const [account] = await tx
    .select()
    .from(billingAccounts)
    .where(eq(billingAccounts.stripeCustomerId, customerId))
    .for("update");
  return account ?? null;
}

export async function lockAccount(
  tx: Transaction,
  organizationId: string,
): Promise<BillingAccount | null> {
  const [account] = await tx
    .select()
    .from(billingAccounts)
    .where(eq(billingAccounts.organizationId, organizationId))
    .for("update");
  return account ?? null;
}

export type MirrorResult =
  | { stored: true; snapshot: SubscriptionSnapshot; linked: boolean }
  | {
      stored: false;
      reason: "missing" | "other_customer" | "other_subscription";
    };

/**
 * Whether a subscription may be stored on the account: the linked one, any
 * when none is linked, or one that bills once the linked one has stopped
 * billing (a late event about an older, ended subscription changes nothing).
 */
function mayFollow(
  account: BillingAccount,
  snapshot: SubscriptionSnapshot,
): boolean {
  if (
    !account.stripeSubscriptionId ||
    account.stripeSubscriptionId === snapshot.subscriptionId
  )
    return true;
  return !hasLiveSubscription(account) && BILLING_STATUSES.has(snapshot.status);
}

/**
 * Reads the subscription from Stripe and stores its live state on the locked
 * account. `eventBehindAt` is the time of an event whose own copy already
 * showed the subscription behind on payment: a date for when trouble began
 * if the invoice gives none.
 */
export async function mirrorSubscription(
  tx: Transaction,
  account: BillingAccount,
  subscriptionId: string,
  options: {
    /** What prompted the read, as the audit trail gives it for any change. */
    cause: string;
    eventBehindAt?: Date | null;
    reconciledAt?: Date;
  },
): Promise<MirrorResult> {
  const live = await retrieveLiveSubscription(subscriptionId);
  if (!live) return { stored: false, reason: "missing" };
  const snapshot = subscriptionSnapshot(live, env().STRIPE_PRICE_LOOKUP_KEY);
  if (snapshot.customerId !== account.stripeCustomerId)
    return { stored: false, reason: "other_customer" };
  if (!mayFollow(account, snapshot)) {
    // A second live subscription beside the linked live one: the customer
    // may be paying twice, which only a person can sort out.
    if (BILLING_STATUSES.has(snapshot.status))
      console.warn(
        `[billing] customer ${account.stripeCustomerId} has a second live subscription ${snapshot.subscriptionId} beside ${account.stripeSubscriptionId}; it is not linked — check Stripe for double billing`,
      );
    return { stored: false, reason: "other_subscription" };
  }
  const now = new Date();
  const state = {
    stripeSubscriptionId: snapshot.subscriptionId,
    status: snapshot.status,
    quantity: snapshot.quantity,
    currentPeriodEnd: snapshot.currentPeriodEnd,
    cancelAtPeriodEnd: snapshot.cancelAtPeriodEnd,
  };
  await recordBillingChange(tx, {
    organizationId: account.organizationId,
    before: account,
    after: state,
    reason: options.cause,
  });
  await tx
    .update(billingAccounts)
    .set({
      ...state,
      pastDueSince: nextPastDueSince(
        snapshot.status,
        account.pastDueSince,
        troubleStart(live, options.eventBehindAt ?? null, now),
      ),
      updatedAt: now,
      ...(options.reconciledAt
        ? { lastReconciledAt: options.reconciledAt }
        : {}),
    })
    .where(eq(billingAccounts.organizationId, account.organizationId));
  return {
    stored: true,
    snapshot,
    linked: account.stripeSubscriptionId !== snapshot.subscriptionId,
  };
}
