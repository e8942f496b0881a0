/**
 * Stripe's webhook events, checked and applied. The HTTP side lives in
 * app/api/billing-webhook.server.ts.
 */
import type Stripe from "stripe";
import { env } from "~/env.server";
import { applyStripeEvent } from "./apply-event.server";
import { stripe } from "./stripe.server";
import { afterMeteredChange } from "./sync-quantity.server";

/** The event, when the signature matches the exact bytes; else null. */
export function verifyStripeEvent(
  body: Buffer,
  signature: string | undefined,
): Stripe.Event | null {
  if (!signature) return null;
  try {
    return stripe().webhooks.constructEvent(
      body,
      signature,
      env().STRIPE_WEBHOOK_SECRET,
    );
  } catch {
    return null;
  }
}

/**
 * Applies an event once. `afterAnswer` runs after Stripe has had its answer:
 * a Checkout bills the count from when it was opened, so sites metered since
 * then are added once the subscription is known. It never throws.
 */
export async function receiveStripeEvent(event: Stripe.Event) {
  const { outcome, linked } = await applyStripeEvent(event);
  const afterAnswer = () => {
    if (linked)
      void afterMeteredChange(
        linked.organizationId,
        `linked:${linked.subscriptionId}`,
      );
  };
  return { outcome, afterAnswer };
}
