/**
 * POST /api/v1/billing/webhook. The route gets the raw body
 * (express.raw in api/router.server.ts): Stripe signs the exact bytes, so the
 * body must not be parsed before the signature is checked.
 */
import type { NextFunction, Request, Response } from "express";
import type Stripe from "stripe";
import { sendError } from "~/api/respond.server";
import { env } from "~/env.server";
import { applyStripeEvent } from "./apply-event.server";
import { stripe } from "./stripe.server";
import { afterMeteredChange } from "./sync-quantity.server";

/** Stripe's events are small; anything larger is not one of them. */
export const WEBHOOK_BODY_LIMIT = "512kb";

function verify(req: Request): Stripe.Event | null {
  const signature = req.get("stripe-signature");
  if (!signature || !Buffer.isBuffer(req.body)) return null;
  try {
    return stripe().webhooks.constructEvent(
      req.body,
      signature,
      env().STRIPE_WEBHOOK_SECRET,
    );
  } catch {
    return null;
  }
}

export async function stripeWebhook(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  const event = verify(req);
  if (!event) {
    return sendError(
      res,
      400,
      "invalid_signature",
      "The Stripe-Signature header is missing or does not match the body.",
    );
  }
  try {
    const { outcome, linked } = await applyStripeEvent(event);
    res.json({ received: true, id: event.id, outcome });
    // A Checkout bills the count from when it was opened; sites metered
    // since then are added now the subscription is known. Not awaited:
    // Stripe wants its answer quickly, and the sync never throws.
    if (linked)
      void afterMeteredChange(
        linked.organizationId,
        `linked:${linked.subscriptionId}`,
      );
  } catch (error) {
    // Nothing was recorded: Stripe delivers the event again later.
    next(error);
  }
}
