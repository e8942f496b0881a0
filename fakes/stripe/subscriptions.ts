/**
 * Subscription life: start (with or without a trial), quantity changes with
 * prorations, cancellation, and renewal when the fake clock passes a period
 * end. Each change emits the webhooks Stripe would send; the subscription's
 * own event goes first, the invoice events it caused follow.
 */
import { addInterval, nextPeriodEnd, type Ctx } from "./context";
import { StripeFakeError, invalid } from "./errors";
import {
  addPendingItem,
  attemptPayment,
  createInvoice,
  cycleLine,
  pendingLines,
  prorationLine,
  type QuantityChange,
} from "./invoices";
import { newSubscription } from "./objects";
import {
  mergeMetadata,
  type Metadata,
  type Price,
  type Subscription,
} from "./store";

export function startSubscription(
  ctx: Ctx,
  fields: {
    customer: string;
    price: Price;
    quantity: number;
    trialDays: number | null;
    metadata: Metadata;
  },
): Subscription {
  const recurring = fields.price.recurring;
  if (!recurring)
    throw invalid("items[0][price]", "A subscription needs a recurring price.");
  const now = ctx.now();
  const trialEnd = fields.trialDays ? now + fields.trialDays * 86_400 : null;
  const periodEnd =
    trialEnd ?? addInterval(now, recurring.interval, recurring.interval_count);
  const sub = newSubscription(ctx, { ...fields, periodEnd, trialEnd });
  ctx.state.subscriptions.push(sub);
  const later = ctx.capture(() => {
    if (trialEnd) return;
    const first = cycleLine(ctx, sub, { start: now, end: periodEnd });
    const invoice = createInvoice(ctx, sub, "subscription_create", [first], {
      start: now,
      end: now,
    });
    // A failed first payment leaves the subscription incomplete, as Stripe does.
    sub.status = attemptPayment(ctx, invoice) ? "active" : "incomplete";
  });
  ctx.emit("customer.subscription.created", sub);
  ctx.publish(later);
  return sub;
}

/** After a payment attempt the status follows the latest invoice. */
function settle(sub: Subscription, paid: boolean): void {
  if (sub.status === "canceled") return;
  if (paid) sub.status = "active";
  else if (sub.status !== "incomplete") sub.status = "past_due";
}

export function changeQuantity(
  ctx: Ctx,
  sub: Subscription,
  change: QuantityChange,
): void {
  const item = sub.items.data[0];
  const { current_period_start: start, current_period_end: end } = item;
  if (change.at < start || change.at > end)
    throw invalid(
      "proration_date",
      "proration_date must lie in the current period.",
    );
  const proration =
    change.behavior === "none"
      ? null
      : prorationLine(ctx, sub, change.quantity, change.at);
  item.quantity = change.quantity;
  if (proration) addPendingItem(ctx, sub, proration);
  if (change.behavior !== "always_invoice") return;
  const pending = pendingLines(ctx, sub);
  if (!pending.length) return;
  const now = ctx.now();
  const invoice = createInvoice(ctx, sub, "subscription_update", pending, {
    start: now,
    end: now,
  });
  settle(sub, attemptPayment(ctx, invoice));
}

export interface SubscriptionUpdate {
  quantity?: { itemId: string; change: QuantityChange };
  cancelAtPeriodEnd?: boolean;
  metadata?: Metadata | "";
}

export function updateSubscription(
  ctx: Ctx,
  sub: Subscription,
  update: SubscriptionUpdate,
): Subscription {
  if (
    sub.status === "canceled" &&
    (update.quantity || update.cancelAtPeriodEnd !== undefined)
  )
    throw new StripeFakeError(
      400,
      "invalid_request_error",
      "A canceled subscription can only update its metadata.",
    );
  const before = JSON.stringify(sub);
  const later = ctx.capture(() => {
    if (update.quantity) {
      if (update.quantity.itemId !== sub.items.data[0].id)
        throw invalid(
          "items[0][id]",
          `No such subscription item: '${update.quantity.itemId}'`,
        );
      changeQuantity(ctx, sub, update.quantity.change);
    }
    if (update.cancelAtPeriodEnd !== undefined)
      setCancelAtPeriodEnd(ctx, sub, update.cancelAtPeriodEnd);
    sub.metadata = mergeMetadata(sub.metadata, update.metadata);
  });
  if (JSON.stringify(sub) !== before)
    ctx.emit("customer.subscription.updated", sub);
  ctx.publish(later);
  return sub;
}

function setCancelAtPeriodEnd(ctx: Ctx, sub: Subscription, on: boolean): void {
  sub.cancel_at_period_end = on;
  sub.cancel_at = on ? sub.items.data[0].current_period_end : null;
  // Stripe records when cancellation was requested, and forgets it on resume.
  sub.canceled_at = on ? ctx.now() : null;
  sub.cancellation_details.reason = on ? "cancellation_requested" : null;
}

export function cancelSubscription(
  ctx: Ctx,
  sub: Subscription,
  endedAt = ctx.now(),
): Subscription {
  if (sub.status === "canceled")
    throw invalid(
      "subscription",
      `The subscription '${sub.id}' is already canceled.`,
    );
  sub.status = "canceled";
  sub.canceled_at ??= endedAt;
  sub.ended_at = endedAt;
  sub.cancel_at = null;
  sub.cancellation_details.reason ??= "cancellation_requested";
  ctx.emit("customer.subscription.deleted", sub);
  return sub;
}

/** Pays an open invoice on request (portal, hosted page, API); a paid
 * latest invoice brings a past_due subscription back to active. */
export function payInvoice(ctx: Ctx, invoiceId: string): boolean {
  const invoice = ctx.state.invoices.find((i) => i.id === invoiceId);
  if (!invoice || invoice.status !== "open")
    throw invalid("invoice", `Invoice ${invoiceId} is not open.`);
  const sub = ctx.state.subscriptions.find(
    (s) => s.id === invoice.parent.subscription_details.subscription,
  );
  const paid = attemptPayment(ctx, invoice);
  if (sub && sub.latest_invoice === invoice.id) {
    const before = sub.status;
    settle(sub, paid);
    if (sub.status !== before) ctx.emit("customer.subscription.updated", sub);
  }
  return paid;
}

const RENEWING = new Set(["trialing", "active", "past_due"]);

/** Renews (or ends) every subscription whose period the clock has passed,
 * as often as needed to catch up. Returns how many periods were closed. */
export function renewDue(ctx: Ctx): number {
  let closed = 0;
  for (;;) {
    const now = ctx.now();
    const due = ctx.state.subscriptions.filter(
      (s) =>
        RENEWING.has(s.status) && s.items.data[0].current_period_end <= now,
    );
    if (!due.length) return closed;
    for (const sub of due) renewOne(ctx, sub);
    closed += due.length;
  }
}

function renewOne(ctx: Ctx, sub: Subscription): void {
  const item = sub.items.data[0];
  const boundary = item.current_period_end;
  if (sub.cancel_at_period_end) {
    cancelSubscription(ctx, sub, boundary);
    return;
  }
  const usage = { start: item.current_period_start, end: boundary };
  const end = nextPeriodEnd(
    sub.billing_cycle_anchor,
    boundary,
    item.price.recurring!,
  );
  item.current_period_start = boundary;
  item.current_period_end = end;
  if (sub.status === "trialing") sub.status = "active";
  const later = ctx.capture(() => {
    const drafts = [
      cycleLine(ctx, sub, { start: boundary, end }),
      ...pendingLines(ctx, sub),
    ];
    const invoice = createInvoice(
      ctx,
      sub,
      "subscription_cycle",
      drafts,
      usage,
    );
    settle(sub, attemptPayment(ctx, invoice));
  });
  ctx.emit("customer.subscription.updated", sub);
  ctx.publish(later);
}
