/**
 * Reconciliation: compares each subscription in Stripe with the estate and
 * repairs drift (a quantity sync that failed, a change made in Stripe's
 * dashboard, a lost webhook). Runs as a job of the PostgreSQL queue
 * (app/jobs/handlers.server.ts), once across all processes, and from the
 * billing page's "Check now".
 */
import { db } from "~/db/client.server";
import { billingAccounts } from "~/db/schema";
import { env } from "~/env.server";
import {
  BILLING_STATUSES,
  findBillingAccount,
  hasLiveSubscription,
  type BillingAccount,
} from "./account.server";
import { quantityKey } from "./idempotency";
import {
  lockAccount,
  mirrorSubscription,
  SHORT_READ,
} from "./live-subscription.server";
import { countMeteredSites } from "./metered-sites.server";
import { planQuantity } from "./plan";
import {
  siteItem,
  subscriptionSnapshot,
  subscriptionToFollow,
} from "./stripe-objects";
import { stripe } from "./stripe.server";

export interface ReconcileOutcome {
  organizationId: string;
  result: "in_step" | "repaired" | "ended" | "no_subscription" | "failed";
  /** A subscription found in Stripe that the account did not know was linked. */
  linked: boolean;
  /** The quantity the estate calls for, and what Stripe had. */
  expected: number | null;
  found: number | null;
  message?: string;
}

/**
 * The subscription to check: the linked one while it bills; otherwise the
 * customer's newest one that bills, found by listing them in Stripe, which
 * finds a Checkout whose webhook never arrived.
 */
async function subscriptionToCheck(
  account: BillingAccount,
): Promise<string | null> {
  if (hasLiveSubscription(account)) return account.stripeSubscriptionId;
  const listed = await stripe().subscriptions.list(
    { customer: account.stripeCustomerId, status: "all", limit: 20 },
    SHORT_READ,
  );
  const { follow, others } = subscriptionToFollow(
    listed.data,
    account.stripeSubscriptionId,
    BILLING_STATUSES,
  );
  if (others.length)
    console.warn(
      `[billing] customer ${account.stripeCustomerId} has more than one live subscription (${[follow, ...others].join(", ")}); following ${follow} — check Stripe for double billing`,
    );
  return follow ?? account.stripeSubscriptionId;
}

/** Sets Stripe's quantity to the count if it drifted; changes nothing locally. */
async function repairQuantity(
  organizationId: string,
  subscriptionId: string,
  runId: string,
) {
  const lookupKey = env().STRIPE_PRICE_LOOKUP_KEY;
  const api = stripe();
  const subscription = await api.subscriptions.retrieve(subscriptionId);
  const live = subscriptionSnapshot(subscription, lookupKey);
  const item = siteItem(subscription, lookupKey);
  const expected = planQuantity(await countMeteredSites({ organizationId }));
  const drift =
    item !== null &&
    BILLING_STATUSES.has(live.status) &&
    live.quantity !== expected;
  if (drift) {
    await api.subscriptionItems.update(
      item.id,
      { quantity: expected, proration_behavior: "create_prorations" },
      { idempotencyKey: quantityKey(item.id, `reconcile:${runId}`, expected) },
    );
  }
  return { expected, found: live.quantity, drift };
}

async function reconcileAccount(
  account: BillingAccount,
  runId: string,
): Promise<ReconcileOutcome> {
  const { organizationId } = account;
  const subscriptionId = await subscriptionToCheck(account);
  if (!subscriptionId)
    return {
      organizationId,
      result: "no_subscription",
      linked: false,
      expected: null,
      found: null,
    };
  const repair = await repairQuantity(organizationId, subscriptionId, runId);
  // Then Stripe's live state (status, period, cancellation) is stored under
  // the account's lock, as a webhook would: this repairs a lost event.
  const mirrored = await db.transaction(async (tx) => {
    const locked = await lockAccount(tx, organizationId);
    if (!locked) throw new Error(`no billing account for ${organizationId}`);
    return mirrorSubscription(tx, locked, subscriptionId, {
      cause: "Checked against Stripe (reconciliation)",
      reconciledAt: new Date(),
    });
  });
  if (!mirrored.stored)
    throw new Error(
      `subscription ${subscriptionId} could not be stored (${mirrored.reason})`,
    );
  const billing = BILLING_STATUSES.has(mirrored.snapshot.status);
  return {
    organizationId,
    result: !billing ? "ended" : repair.drift ? "repaired" : "in_step",
    linked: mirrored.linked,
    expected: repair.expected,
    found: repair.found,
  };
}

/** One organisation; never throws, a failure is reported in the outcome. */
export async function reconcileOrganization(
  organizationId: string,
  runId = new Date().toISOString(),
): Promise<ReconcileOutcome> {
  try {
    const account = await findBillingAccount(organizationId);
    if (!account) {
      return {
        organizationId,
        result: "no_subscription",
        linked: false,
        expected: null,
        found: null,
      };
    }
    const outcome = await reconcileAccount(account, runId);
    if (outcome.linked)
      console.log(
        `[billing] reconciled ${organizationId}: linked a subscription found in Stripe`,
      );
    if (outcome.result === "repaired") {
      console.log(
        `[billing] reconciled ${organizationId}: quantity ${outcome.found} → ${outcome.expected}`,
      );
    }
    return outcome;
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    console.error(
      `[billing] reconciliation of ${organizationId} failed:`,
      message,
    );
    return {
      organizationId,
      result: "failed",
      linked: false,
      expected: null,
      found: null,
      message,
    };
  }
}

/**
 * Back from Checkout while the account has no live subscription: look for it
 * in Stripe now rather than wait for the webhook.
 */
export async function lookUpAfterCheckout(
  organizationId: string,
): Promise<void> {
  const account = await findBillingAccount(organizationId);
  if (!account || hasLiveSubscription(account)) return;
  await reconcileOrganization(organizationId);
}

let running: Promise<ReconcileOutcome[]> | null = null;

/**
 * Every billing account, one by one: those with a live subscription get the
 * quantity check; the others one list call each, which links a subscription
 * whose Checkout webhook was lost. `runId` goes into the idempotency keys of
 * the run's quantity changes: the queue passes its job id, so a retried run
 * is answered from Stripe's record instead of changing twice.
 */
export function reconcileBilling(
  runId = new Date().toISOString(),
): Promise<ReconcileOutcome[]> {
  // A slow run is not overlapped by another in this process (the queue's
  // stately policy keeps runs single across processes).
  running ??= (async () => {
    const rows = await db
      .select({ organizationId: billingAccounts.organizationId })
      .from(billingAccounts);
    const outcomes: ReconcileOutcome[] = [];
    for (const row of rows) {
      outcomes.push(await reconcileOrganization(row.organizationId, runId));
    }
    return outcomes;
  })().finally(() => {
    running = null;
  });
  return running;
}
