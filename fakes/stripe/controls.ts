/**
 * Test controls under /_fake: no API key, loopback callers only, JSON in and
 * out. Stripe has no such routes; they stand in for test clocks, the test
 * cards of a failing customer, and the dashboard's event log.
 */
import express, { Router, type RequestHandler } from "express";
import { z } from "zod";
import { mustFind, type Ctx } from "./context";
import { StripeFakeError, parse } from "./errors";
import { emptyState } from "./store";
import { renewDue } from "./subscriptions";

const LOOPBACK = new Set(["127.0.0.1", "::1", "::ffff:127.0.0.1"]);

const loopbackOnly: RequestHandler = (req, res, next) => {
  if (LOOPBACK.has(req.socket.remoteAddress ?? "")) return next();
  res
    .status(403)
    .json(
      new StripeFakeError(
        403,
        "invalid_request_error",
        "Test controls answer loopback callers only.",
      ).body(),
    );
};

const advanceBody = z.union([
  z.strictObject({
    seconds: z
      .number()
      .int()
      .min(1)
      .max(10 * 366 * 86_400),
  }),
  z.strictObject({
    days: z
      .number()
      .min(0.0001)
      .max(10 * 366),
  }),
]);
const endpointBody = z.strictObject({
  url: z.url().nullable(),
  secret: z.string().startsWith("whsec_").optional(),
});

export function controlRoutes(ctx: Ctx): Router {
  const r = Router();
  const { state, bus } = ctx;
  r.use("/_fake", loopbackOnly, express.json());

  r.post("/_fake/fail-next-payment", (req, res) => {
    const { customer } = parse(
      z.strictObject({ customer: z.string() }),
      req.body,
    );
    mustFind(state.customers, customer, "customer", "customer");
    state.failNext.push(customer);
    res.json({
      armed: customer,
      pending_failures: state.failNext.filter((c) => c === customer).length,
    });
  });

  r.post("/_fake/advance", (req, res) => {
    const body = parse(advanceBody, req.body);
    const seconds =
      "seconds" in body ? body.seconds : Math.round(body.days * 86_400);
    state.clockOffset += seconds;
    const periodsClosed = renewDue(ctx);
    res.json({
      now: ctx.now(),
      offset_seconds: state.clockOffset,
      periods_closed: periodsClosed,
    });
  });

  r.get("/_fake/events", (req, res) => {
    const type =
      typeof req.query.type === "string" ? req.query.type : undefined;
    const data = state.events
      .filter((e) => !type || e.type === type)
      .map((e) => ({ ...e, delivery_attempts: state.deliveries[e.id] ?? [] }));
    res.json({ object: "list", data, has_more: false, url: "/_fake/events" });
  });

  r.post("/_fake/events/:id/redeliver", (req, res) => {
    const event = mustFind(state.events, req.params.id, "event");
    bus.enqueue(event);
    res.json({ queued: event.id });
  });

  r.post("/_fake/flush", async (_req, res) => {
    await bus.flush();
    res.json({ flushed: true });
  });

  r.get("/_fake/state", (_req, res) => {
    res.json({
      now: ctx.now(),
      offset_seconds: state.clockOffset,
      webhook_url: bus.endpoint?.url ?? null,
      counts: {
        customers: state.customers.length,
        products: state.products.length,
        prices: state.prices.length,
        subscriptions: state.subscriptions.length,
        invoices: state.invoices.length,
        invoice_items: state.invoiceItems.length,
        checkout_sessions: state.checkoutSessions.length,
        portal_sessions: state.portalSessions.length,
        events: state.events.length,
      },
      pending_failures: state.failNext,
    });
  });

  r.post("/_fake/webhook-endpoint", (req, res) => {
    const body = parse(endpointBody, req.body);
    const secret = body.secret ?? bus.endpoint?.secret;
    if (body.url && !secret)
      throw new StripeFakeError(
        400,
        "invalid_request_error",
        "A webhook endpoint needs a whsec_… secret.",
        {
          param: "secret",
        },
      );
    bus.endpoint = body.url && secret ? { url: body.url, secret } : null;
    res.json({ url: bus.endpoint?.url ?? null });
  });

  // Forgets every object and event (the webhook endpoint stays).
  r.post("/_fake/reset", async (_req, res) => {
    await bus.flush();
    Object.assign(state, emptyState());
    res.json({ reset: true });
  });
  return r;
}
