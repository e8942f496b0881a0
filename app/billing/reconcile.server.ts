/**
 * Reconciliation: compares each subscription in Stripe with the estate and
 * repairs drift (a quantity sync that failed, a change made in Stripe's
 * dashboard, a lost webhook). Runs on a timer (app.server.ts) and from the
 * billing page's "Check now".
 */
import { and, eq, inArray, isNotNull } from "drizzle-orm";
import { db } from "~/db/client.server";
import { billingAccounts } from "~/db/schema";
import { env } from "~/env.server";
import {
  BILLING_STATUSES,
  findBillingAccount,
  type BillingAccount,
} from "./account.server";
import { quantityKey } from "./idempotency";
import { countMeteredSites } from "./metered-sites.server";
import { planQuantity } from "./plan";
import { nextPastDueSince } from "./standing";
import { siteItem, subscriptionSnapshot } from "./stripe-objects";
import { stripe } from "./stripe.server";

export interface ReconcileOutcome {
  organizationId: string;
  result: "in_step" | "repaired" | "no_subscription" | "failed";
  /** The quantity the estate calls for, and what Stripe had. */
  expected: number | null;
  found: number | null;
  message?: string;
}

async function repairQuantity(
  account: BillingAccount,
  runId: string,
): Promise<ReconcileOutcome> {
  const lookupKey = env().STRIPE_PRICE_LOOKUP_KEY;
  const api = stripe();
  const subscription = await api.subscriptions.retrieve(
    account.stripeSubscriptionId!,
  );
  const live = subscriptionSnapshot(subscription, lookupKey);
  const item = siteItem(subscription, lookupKey);
  const expected = planQuantity(
    await countMeteredSites({ organizationId: account.organizationId }),
  );
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
  // Stripe's live state also repairs a status whose webhook was lost.
  const now = new Date();
  await db
    .update(billingAccounts)
    .set({
      status: live.status,
      quantity: drift ? expected : live.quantity,
      currentPeriodEnd: live.currentPeriodEnd,
      cancelAtPeriodEnd: live.cancelAtPeriodEnd,
      pastDueSince: nextPastDueSince(live.status, account.pastDueSince, now),
      lastReconciledAt: now,
      updatedAt: now,
    })
    .where(eq(billingAccounts.organizationId, account.organizationId));
  return {
    organizationId: account.organizationId,
    result: drift ? "repaired" : "in_step",
    expected,
    found: live.quantity,
  };
}

/** One organisation; never throws, a failure is reported in the outcome. */
export async function reconcileOrganization(
  organizationId: string,
  runId = new Date().toISOString(),
): Promise<ReconcileOutcome> {
  try {
    const account = await findBillingAccount(organizationId);
    if (!account?.stripeSubscriptionId) {
      return {
        organizationId,
        result: "no_subscription",
        expected: null,
        found: null,
      };
    }
    const outcome = await repairQuantity(account, runId);
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
      expected: null,
      found: null,
      message,
    };
  }
}

let running: Promise<ReconcileOutcome[]> | null = null;

/** Every organisation with a subscription that still bills, one by one. */
export function reconcileBilling(): Promise<ReconcileOutcome[]> {
  // A slow run is not overlapped by the next tick of the timer.
  running ??= (async () => {
    const runId = new Date().toISOString();
    const rows = await db
      .select({ organizationId: billingAccounts.organizationId })
      .from(billingAccounts)
      .where(
        and(
          isNotNull(billingAccounts.stripeSubscriptionId),
          inArray(billingAccounts.status, [...BILLING_STATUSES]),
        ),
      );
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
