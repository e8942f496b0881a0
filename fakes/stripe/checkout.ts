/**
 * Checkout Sessions and billing portal sessions: creating them through the
 * API, and what happens when someone pays or acts on the fake's pages.
 */
import type { z } from "zod";
import { mustFind, type Ctx } from "./context";
import { invalid } from "./errors";
import { consumeFailure } from "./invoices";
import { newCustomer } from "./objects";
import type { checkoutCreate } from "./params";
import {
  mergeMetadata,
  newId,
  type CheckoutSession,
  type PortalSession,
} from "./store";
import {
  cancelSubscription,
  payInvoice,
  startSubscription,
  updateSubscription,
} from "./subscriptions";

const DAY = 86_400;
export const DECLINED_CARD = "4000000000000002";

export function createCheckoutSession(
  ctx: Ctx,
  p: z.output<typeof checkoutCreate>,
): CheckoutSession {
  if (p.customer && p.customer_email)
    throw invalid(
      "customer_email",
      "You may only specify one of these parameters: customer, customer_email.",
    );
  if (p.customer)
    mustFind(ctx.state.customers, p.customer, "customer", "customer");
  const line = p.line_items[0];
  const price = mustFind(
    ctx.state.prices,
    line.price,
    "price",
    "line_items[0][price]",
  );
  if (!price.recurring || !price.active)
    throw invalid(
      "line_items[0][price]",
      "mode=subscription needs an active recurring price.",
    );
  const quantity = line.quantity ?? 1;
  const trialDays = p.subscription_data?.trial_period_days ?? null;
  const amount = trialDays ? 0 : price.unit_amount * quantity;
  const now = ctx.now();
  const id = newId("cs_test");
  const session: CheckoutSession = {
    id,
    object: "checkout.session",
    created: now,
    livemode: false,
    amount_subtotal: amount,
    amount_total: amount,
    cancel_url: p.cancel_url ?? null,
    client_reference_id: p.client_reference_id ?? null,
    currency: price.currency,
    customer: p.customer ?? null,
    customer_email: p.customer_email ?? null,
    expires_at: now + DAY,
    invoice: null,
    metadata: mergeMetadata({}, p.metadata),
    mode: "subscription",
    payment_method_types: ["card"],
    payment_status: "unpaid",
    status: "open",
    subscription: null,
    success_url: p.success_url,
    ui_mode: "hosted",
    url: `${ctx.baseUrl()}/checkout/${id}`,
  };
  ctx.state.checkoutSessions.push(session);
  ctx.state.checkoutPlans[id] = {
    price: price.id,
    quantity,
    subscriptionMetadata: mergeMetadata({}, p.subscription_data?.metadata),
    trialDays,
  };
  return session;
}

/** Open sessions expire after 24 h of fake time, or when asked to. */
export function refreshExpiry(ctx: Ctx, session: CheckoutSession, now = false) {
  if (session.status !== "open") return;
  if (!now && ctx.now() < session.expires_at) return;
  session.status = "expired";
  session.url = null;
  ctx.emit("checkout.session.expired", session);
}

export type PayResult =
  { ok: true; redirect: string } | { ok: false; message: string };

/** The Pay button: a declined card or an armed failure creates nothing. */
export function payCheckout(
  ctx: Ctx,
  session: CheckoutSession,
  card: string,
): PayResult {
  refreshExpiry(ctx, session);
  if (session.status !== "open")
    return {
      ok: false,
      message: `This checkout session is ${session.status}.`,
    };
  const digits = card.replace(/[\s-]/g, "");
  if (!/^\d{12,19}$/.test(digits))
    return { ok: false, message: "Enter a card number (digits only)." };
  if (
    digits === DECLINED_CARD ||
    (session.customer && consumeFailure(ctx, session.customer))
  )
    return {
      ok: false,
      message: "Your card was declined. Nothing was charged or created.",
    };
  const plan = ctx.state.checkoutPlans[session.id];
  const customer = session.customer ?? createCheckoutCustomer(ctx, session);
  const sub = startSubscription(ctx, {
    customer,
    price: mustFind(ctx.state.prices, plan.price, "price"),
    quantity: plan.quantity,
    trialDays: plan.trialDays,
    metadata: plan.subscriptionMetadata,
  });
  Object.assign(session, {
    customer,
    status: "complete",
    payment_status: plan.trialDays ? "no_payment_required" : "paid",
    subscription: sub.id,
    invoice: sub.latest_invoice,
    url: null,
  });
  ctx.emit("checkout.session.completed", session);
  return {
    ok: true,
    redirect: session.success_url.replaceAll(
      "{CHECKOUT_SESSION_ID}",
      session.id,
    ),
  };
}

function createCheckoutCustomer(ctx: Ctx, session: CheckoutSession): string {
  const customer = newCustomer(ctx, {
    email: session.customer_email ?? undefined,
    metadata: {},
  });
  ctx.state.customers.push(customer);
  ctx.emit("customer.created", customer);
  return customer.id;
}

export function createPortalSession(
  ctx: Ctx,
  customerId: string,
  returnUrl: string | undefined,
): PortalSession {
  const customer = mustFind(
    ctx.state.customers,
    customerId,
    "customer",
    "customer",
  );
  const id = newId("bps");
  const session: PortalSession = {
    id,
    object: "billing_portal.session",
    created: ctx.now(),
    livemode: false,
    configuration: "bpc_local_fake_default",
    customer: customer.id,
    customer_account: null,
    flow: null,
    locale: null,
    on_behalf_of: null,
    return_url: returnUrl ?? null,
    url: `${ctx.baseUrl()}/portal/${id}`,
  };
  ctx.state.portalSessions.push(session);
  return session;
}

export type PortalAction =
  "cancel_at_period_end" | "resume" | "cancel_now" | "pay_invoice";

/** A portal button; only the session customer's own objects can be touched.
 * Returns the notice to show. */
export function portalAction(
  ctx: Ctx,
  session: PortalSession,
  action: PortalAction,
  target: string,
): string {
  if (action === "pay_invoice") {
    const invoice = ctx.state.invoices.find(
      (i) => i.id === target && i.customer === session.customer,
    );
    if (!invoice)
      throw invalid("invoice", "No such invoice for this customer.");
    if (invoice.status !== "open")
      return invoice.status === "paid" ? "paid" : "not_open";
    return payInvoice(ctx, invoice.id) ? "paid" : "declined";
  }
  const sub = ctx.state.subscriptions.find(
    (s) => s.id === target && s.customer === session.customer,
  );
  if (!sub)
    throw invalid("subscription", "No such subscription for this customer.");
  if (action === "cancel_now") cancelSubscription(ctx, sub);
  else
    updateSubscription(ctx, sub, {
      cancelAtPeriodEnd: action === "cancel_at_period_end",
    });
  return action;
}
