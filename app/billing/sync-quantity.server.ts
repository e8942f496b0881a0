/**
 * Keeps the subscription's quantity equal to the metered-site count. Called
 * after a change that can alter the count has committed; never inside the
 * transaction, and never failing the change itself: if Stripe is away, the
 * drift is logged and the reconciliation job repairs it.
 */
import { eq } from "drizzle-orm";
import { actionLabel } from "~/audit/kinds";
import { withAdvisoryLock } from "~/db/advisory-lock.server";
import { db } from "~/db/client.server";
import { billingAccounts } from "~/db/schema";
import { env } from "~/env.server";
import { findBillingAccount, hasLiveSubscription } from "./account.server";
import { recordBillingChange } from "./billing-audit.server";
import { quantityKey } from "./idempotency";
import { countMeteredSites } from "./metered-sites.server";
import { planQuantity } from "./plan";
import { siteItem } from "./stripe-objects";
import { stripe } from "./stripe.server";

export interface QuantityChange {
  organizationId: string;
  /** Stripe's quantity before, and the quantity the estate calls for. */
  from: number;
  to: number;
  changed: boolean;
}

/**
 * Sets the subscription item's quantity to the current count, if it differs.
 * `cause` names the change (e.g. `meter.created:<id>`) and goes into the
 * idempotency key, so a retry of the same change cannot apply twice.
 */
export async function syncSubscriptionQuantity(args: {
  organizationId: string;
  cause: string;
}): Promise<QuantityChange | null> {
  const account = await findBillingAccount(args.organizationId);
  if (!account || !hasLiveSubscription(account)) return null;
  const api = stripe();
  const subscription = await api.subscriptions.retrieve(
    account.stripeSubscriptionId!,
  );
  const item = siteItem(subscription, env().STRIPE_PRICE_LOOKUP_KEY);
  if (!item) throw new Error(`subscription ${subscription.id} has no items`);
  const target = planQuantity(
    await countMeteredSites({ organizationId: args.organizationId }),
  );
  const from = item.quantity ?? 0;
  if (from !== target) {
    await api.subscriptionItems.update(
      item.id,
      { quantity: target, proration_behavior: "create_prorations" },
      { idempotencyKey: quantityKey(item.id, args.cause, target) },
    );
  }
  await db.transaction(async (tx) => {
    const [before] = await tx
      .select()
      .from(billingAccounts)
      .where(eq(billingAccounts.organizationId, args.organizationId))
      .for("update");
    if (!before) return;
    await tx
      .update(billingAccounts)
      .set({ quantity: target, updatedAt: new Date() })
      .where(eq(billingAccounts.organizationId, args.organizationId));
    await recordBillingChange(tx, {
      organizationId: args.organizationId,
      before,
      after: { ...before, quantity: target },
      reason: causeInWords(args.cause),
    });
  });
  return {
    organizationId: args.organizationId,
    from,
    to: target,
    changed: from !== target,
  };
}

/** `meter.created:<id>` as a reason someone reads in the audit trail. */
function causeInWords(cause: string): string {
  const [what] = cause.split(":");
  if (what === "linked")
    return "Metered sites counted when the subscription was linked";
  return `Metered sites counted after: ${actionLabel(what)}`;
}

/** How long a user's request waits for Stripe before answering anyway. */
const WAIT_MS = 8_000;

// One sync at a time per organisation, so two quick changes cannot overtake
// each other and leave the older count in Stripe: queued in this process,
// and under a PostgreSQL advisory lock across processes and machines.
const queues = new Map<string, Promise<void>>();

function enqueue(organizationId: string, cause: string): Promise<void> {
  const previous = queues.get(organizationId) ?? Promise.resolve();
  const run = previous.then(() =>
    withAdvisoryLock(`billing-quantity:${organizationId}`, () =>
      syncSubscriptionQuantity({ organizationId, cause }),
    ).then(
      () => undefined,
      (error: unknown) => {
        console.error(
          `[billing] quantity sync for ${organizationId} (${cause}) failed; reconciliation will repair it:`,
          error instanceof Error ? error.message : error,
        );
      },
    ),
  );
  queues.set(organizationId, run);
  void run.then(() => {
    if (queues.get(organizationId) === run) queues.delete(organizationId);
  });
  return run;
}

/**
 * The hook for committed changes to sites and meters. Waits a short while so
 * the page that follows shows the new quantity, but never throws.
 */
export async function afterMeteredChange(
  organizationId: string,
  cause: string,
): Promise<void> {
  let timer: NodeJS.Timeout | undefined;
  const budget = new Promise<void>((resolve) => {
    timer = setTimeout(resolve, WAIT_MS);
    timer.unref();
  });
  await Promise.race([enqueue(organizationId, cause), budget]);
  clearTimeout(timer);
}
