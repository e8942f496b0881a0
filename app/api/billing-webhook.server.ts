/**
 * POST /api/v1/billing/webhook. The route gets the raw body
 * (express.raw in router.server.ts): Stripe signs the exact bytes, so the
 * body must not be parsed before the signature is checked. The billing
 * domain decides what an event means; this handler only speaks HTTP.
 */
import type { NextFunction, Request, Response } from "express";
import {
  receiveStripeEvent,
  verifyStripeEvent,
} from "~/billing/webhook.server";
import type { z } from "zod";
import { sendError } from "./respond.server";
import type { webhookAnswerSchema } from "./schemas";

/** Stripe's events are small; anything larger is not one of them. */
export const WEBHOOK_BODY_LIMIT = "512kb";

export async function stripeWebhook(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  const event = Buffer.isBuffer(req.body)
    ? verifyStripeEvent(req.body, req.get("stripe-signature"))
    : null;
  if (!event) {
    return sendError(
      res,
      400,
      "invalid_signature",
      "The Stripe-Signature header is missing or does not match the body.",
    );
  }
  try {
    const { outcome, afterAnswer } = await receiveStripeEvent(event);
    const answer: z.output<typeof webhookAnswerSchema> = {
      received: true,
      id: event.id,
      outcome,
    };
    res.json(answer);
    afterAnswer();
  } catch (error) {
    // Nothing was recorded: Stripe delivers the event again later.
    next(error);
  }
}
