/**
 * /v1 routes for billing: subscriptions and their items, invoices (with the
 * preview), Checkout Sessions and billing portal sessions.
 */
import { Router } from "express";
import { listOf, mustFind, type Ctx } from "./context";
import {
  StripeFakeError,
  invalid,
  notFound,
  parse,
  unsupported,
} from "./errors";
import { input, reply, retrieveRoute } from "./http";
import { previewInvoice, type QuantityChange } from "./invoices";
import {
  createCheckoutSession,
  createPortalSession,
  refreshExpiry,
} from "./checkout";
import * as P from "./params";
import { mergeMetadata, type Subscription } from "./store";
import {
  cancelSubscription,
  payInvoice,
  startSubscription,
  updateSubscription,
} from "./subscriptions";

export function billingRoutes(ctx: Ctx): Router {
  const r = Router();
  const { state } = ctx;
  const findSub = (id: string, param = "id") =>
    mustFind(state.subscriptions, id, "subscription", param);

  r.post("/v1/subscriptions", (req, res) => {
    const p = parse(P.subscriptionCreate, input(req));
    const customer = mustFind(
      state.customers,
      p.customer,
      "customer",
      "customer",
    );
    const price = mustFind(
      state.prices,
      p.items[0].price,
      "price",
      "items[0][price]",
    );
    const sub = startSubscription(ctx, {
      customer: customer.id,
      price,
      quantity: p.items[0].quantity ?? 1,
      trialDays: p.trial_period_days ?? null,
      metadata: mergeMetadata({}, p.metadata),
    });
    reply(ctx, res, sub, p.expand);
  });
  r.get("/v1/subscriptions", (req, res) => {
    const p = parse(P.subscriptionList, input(req));
    const found = state.subscriptions.filter(
      (s) =>
        (!p.customer || s.customer === p.customer) &&
        (!p.price || s.items.data[0].price.id === p.price) &&
        statusMatches(s, p.status),
    );
    reply(ctx, res, listOf(found, "/v1/subscriptions", p), p.expand);
  });
  retrieveRoute(r, ctx, "/v1/subscriptions", findSub);
  r.post("/v1/subscriptions/:id", (req, res) => {
    const p = parse(P.subscriptionUpdate, input(req));
    const sub = findSub(req.params.id);
    const item = p.items?.[0];
    const quantity =
      item?.quantity !== undefined
        ? { itemId: item.id, change: change(ctx, item.quantity, p) }
        : undefined;
    updateSubscription(ctx, sub, {
      quantity,
      cancelAtPeriodEnd: p.cancel_at_period_end,
      metadata: p.metadata,
    });
    reply(ctx, res, sub, p.expand);
  });
  r.delete("/v1/subscriptions/:id", (req, res) => {
    const p = parse(P.onlyExpand, input(req));
    reply(ctx, res, cancelSubscription(ctx, findSub(req.params.id)), p.expand);
  });

  retrieveRoute(
    r,
    ctx,
    "/v1/subscription_items",
    (id) => subOfItem(ctx, id).items.data[0],
  );
  r.post("/v1/subscription_items/:id", (req, res) => {
    const p = parse(P.subscriptionItemUpdate, input(req));
    const sub = subOfItem(ctx, req.params.id);
    const item = sub.items.data[0];
    if (p.metadata !== undefined)
      item.metadata = mergeMetadata(item.metadata, p.metadata);
    const quantity =
      p.quantity !== undefined
        ? { itemId: item.id, change: change(ctx, p.quantity, p) }
        : undefined;
    updateSubscription(ctx, sub, { quantity });
    reply(ctx, res, item, p.expand);
  });

  r.get("/v1/invoices", (req, res) => {
    const p = parse(P.invoiceList, input(req));
    const found = state.invoices.filter(
      (i) =>
        (!p.customer || i.customer === p.customer) &&
        (!p.subscription ||
          i.parent.subscription_details.subscription === p.subscription) &&
        (!p.status || i.status === p.status),
    );
    reply(ctx, res, listOf(found, "/v1/invoices", p), p.expand);
  });
  r.post("/v1/invoices/create_preview", (req, res) => {
    const p = parse(P.invoicePreview, input(req));
    const sub = previewSubscription(ctx, p.customer, p.subscription);
    const details = p.subscription_details;
    const item = details?.items?.[0];
    if (item && item.id !== sub.items.data[0].id)
      throw invalid(
        "subscription_details[items][0][id]",
        `No such subscription item: '${item.id}'`,
      );
    const quantityChange =
      item?.quantity !== undefined
        ? change(ctx, item.quantity, details ?? {})
        : null;
    reply(ctx, res, previewInvoice(ctx, sub, quantityChange), p.expand);
  });
  retrieveRoute(r, ctx, "/v1/invoices", (id) =>
    mustFind(state.invoices, id, "invoice"),
  );
  r.post("/v1/invoices/:id/pay", (req, res) => {
    const p = parse(P.onlyExpand, input(req));
    const invoice = mustFind(state.invoices, req.params.id, "invoice");
    if (!payInvoice(ctx, invoice.id))
      throw new StripeFakeError(402, "card_error", "Your card was declined.", {
        code: "card_declined",
        decline_code: "generic_decline",
      });
    reply(ctx, res, invoice, p.expand);
  });

  r.post("/v1/checkout/sessions", (req, res) => {
    const p = parse(P.checkoutCreate, input(req));
    if (p.mode !== "subscription")
      throw unsupported(
        `mode=${p.mode}: only mode=subscription is implemented`,
        "mode",
      );
    reply(ctx, res, createCheckoutSession(ctx, p), p.expand);
  });
  retrieveRoute(r, ctx, "/v1/checkout/sessions", (id) => {
    const session = mustFind(state.checkoutSessions, id, "checkout.session");
    refreshExpiry(ctx, session);
    return session;
  });
  r.post("/v1/checkout/sessions/:id/expire", (req, res) => {
    const p = parse(P.onlyExpand, input(req));
    const session = mustFind(
      state.checkoutSessions,
      req.params.id,
      "checkout.session",
    );
    if (session.status !== "open")
      throw invalid(
        "session",
        `Only open sessions can be expired; this one is ${session.status}.`,
      );
    refreshExpiry(ctx, session, true);
    reply(ctx, res, session, p.expand);
  });

  r.post("/v1/billing_portal/sessions", (req, res) => {
    const p = parse(P.portalCreate, input(req));
    reply(
      ctx,
      res,
      createPortalSession(ctx, p.customer, p.return_url),
      p.expand,
    );
  });
  return r;
}

function statusMatches(sub: Subscription, status: string | undefined): boolean {
  if (status === "all") return true;
  if (status === "ended") return sub.status === "canceled";
  if (!status) return sub.status !== "canceled";
  return sub.status === status;
}

function change(
  ctx: Ctx,
  quantity: number,
  p: {
    proration_behavior?: QuantityChange["behavior"];
    proration_date?: number;
  },
): QuantityChange {
  return {
    quantity,
    behavior: p.proration_behavior ?? "create_prorations",
    at: p.proration_date ?? ctx.now(),
  };
}

function subOfItem(ctx: Ctx, itemId: string): Subscription {
  const sub = ctx.state.subscriptions.find(
    (s) => s.items.data[0].id === itemId,
  );
  if (!sub) throw notFound("subscription_item", itemId);
  return sub;
}

/** The subscription a preview is about: named, or the customer's live one. */
function previewSubscription(
  ctx: Ctx,
  customer: string | undefined,
  subscription: string | undefined,
): Subscription {
  if (subscription) {
    const sub = mustFind(
      ctx.state.subscriptions,
      subscription,
      "subscription",
      "subscription",
    );
    if (customer && sub.customer !== customer)
      throw invalid(
        "subscription",
        "The subscription does not belong to that customer.",
      );
    return sub;
  }
  if (!customer) throw invalid("customer", "Pass customer or subscription.");
  mustFind(ctx.state.customers, customer, "customer", "customer");
  const live = [...ctx.state.subscriptions]
    .reverse()
    .find((s) => s.customer === customer && s.status !== "canceled");
  if (!live)
    throw new StripeFakeError(
      400,
      "invalid_request_error",
      `No upcoming invoices for customer: ${customer}`,
      {
        code: "invoice_upcoming_none",
      },
    );
  return live;
}
