/**
 * Invoices: built from line drafts, finalized (numbered, customer balance
 * applied), then paid or failed. Every customer of the fake holds a working
 * test card, except when a test armed `/_fake/fail-next-payment` for it.
 */
import { nextPeriodEnd, type Ctx } from "./context";
import { StripeFakeError } from "./errors";
import {
  day,
  money,
  newInvoiceItem,
  productName,
  toLine,
  type LineDraft,
} from "./objects";
import { newId, type Invoice, type Subscription } from "./store";

export function cycleLine(
  ctx: Ctx,
  sub: Subscription,
  period: { start: number; end: number },
  quantity = sub.items.data[0].quantity,
): LineDraft {
  const price = sub.items.data[0].price;
  const unit = money(price.unit_amount, price.currency);
  const name = productName(ctx, price.product);
  return {
    amount: price.unit_amount * quantity,
    quantity,
    period,
    description: `${quantity} × ${name} (at ${unit} / ${price.recurring?.interval})`,
    proration: false,
    invoiceItem: null,
  };
}

/** The proration for a quantity change at `at`: unit amount × Δquantity ×
 * the share of the current period still to run, in minor units. */
export function prorationLine(
  ctx: Ctx,
  sub: Subscription,
  quantity: number,
  at: number,
): LineDraft | null {
  const item = sub.items.data[0];
  const delta = quantity - item.quantity;
  if (delta === 0 || sub.status === "trialing") return null;
  const { current_period_start: start, current_period_end: end } = item;
  const share = (end - at) / (end - start);
  const name = productName(ctx, item.price.product);
  const what = delta > 0 ? "Remaining time on" : "Unused time on";
  return {
    amount: Math.round(item.price.unit_amount * delta * share),
    quantity: Math.abs(delta),
    period: { start: at, end },
    description: `${what} ${Math.abs(delta)} × ${name} after ${day(at)}`,
    proration: true,
    invoiceItem: null,
  };
}

export function addPendingItem(ctx: Ctx, sub: Subscription, draft: LineDraft) {
  ctx.state.invoiceItems.push(newInvoiceItem(ctx, sub, draft));
}

/** Invoice items of the subscription not yet on an invoice. */
export function pendingLines(ctx: Ctx, sub: Subscription): LineDraft[] {
  return ctx.state.invoiceItems
    .filter(
      (ii) =>
        ii.invoice === null &&
        ii.parent.subscription_details.subscription === sub.id,
    )
    .map((ii) => ({
      amount: ii.amount,
      quantity: ii.quantity,
      period: ii.period,
      description: ii.description,
      proration: ii.proration,
      invoiceItem: ii.id,
    }));
}

function invoiceObject(
  ctx: Ctx,
  sub: Subscription,
  reason: Invoice["billing_reason"],
  drafts: LineDraft[],
  usage: { start: number; end: number },
  id: string,
): Invoice {
  const customer = ctx.state.customers.find((c) => c.id === sub.customer);
  const lines = drafts.map((d) => toLine(d, sub, id));
  const total = lines.reduce((sum, l) => sum + l.amount, 0);
  return {
    id,
    object: "invoice",
    created: ctx.now(),
    livemode: false,
    account_name: "Joulebook (local Stripe fake)",
    amount_due: Math.max(0, total),
    amount_overpaid: 0,
    amount_paid: 0,
    amount_remaining: Math.max(0, total),
    attempt_count: 0,
    attempted: false,
    auto_advance: true,
    billing_reason: reason,
    collection_method: "charge_automatically",
    currency: sub.currency,
    customer: sub.customer,
    customer_email: customer?.email ?? null,
    customer_name: customer?.name ?? null,
    description: null,
    discounts: [],
    due_date: null,
    effective_at: null,
    ending_balance: null,
    hosted_invoice_url: null,
    invoice_pdf: null,
    lines: {
      object: "list",
      data: lines,
      has_more: false,
      total_count: lines.length,
      url: `/v1/invoices/${id}/lines`,
    },
    metadata: {},
    next_payment_attempt: null,
    number: null,
    parent: {
      type: "subscription_details",
      quote_details: null,
      subscription_details: {
        metadata: { ...sub.metadata },
        subscription: sub.id,
      },
    },
    period_start: usage.start,
    period_end: usage.end,
    starting_balance: customer?.balance ?? 0,
    status: "draft",
    status_transitions: {
      finalized_at: null,
      marked_uncollectible_at: null,
      paid_at: null,
      voided_at: null,
    },
    subtotal: total,
    subtotal_excluding_tax: total,
    test_clock: null,
    total,
    total_excluding_tax: total,
    total_taxes: [],
    webhooks_delivered_at: null,
  };
}

/** Creates, stores and finalizes an invoice (invoice.created, .finalized).
 * `usage` is Stripe's invoice period: the period that just ended, or the
 * creation instant for a first invoice; the billed period is on the lines. */
export function createInvoice(
  ctx: Ctx,
  sub: Subscription,
  reason: Invoice["billing_reason"],
  drafts: LineDraft[],
  usage: { start: number; end: number },
): Invoice {
  const invoice = invoiceObject(ctx, sub, reason, drafts, usage, newId("in"));
  invoice.hosted_invoice_url = `${ctx.baseUrl()}/invoices/${invoice.id}`;
  ctx.state.invoices.push(invoice);
  for (const draft of drafts) {
    const ii = ctx.state.invoiceItems.find((i) => i.id === draft.invoiceItem);
    if (ii) ii.invoice = invoice.id;
  }
  sub.latest_invoice = invoice.id;
  ctx.emit("invoice.created", invoice);
  finalize(ctx, invoice);
  return invoice;
}

function finalize(ctx: Ctx, invoice: Invoice): void {
  const customer = ctx.state.customers.find((c) => c.id === invoice.customer);
  const balance = customer?.balance ?? 0;
  // A negative customer balance is credit (from a quantity decrease): it is
  // used up before anything is charged.
  const due = invoice.total + balance;
  invoice.starting_balance = balance;
  invoice.amount_due = invoice.amount_remaining = Math.max(0, due);
  invoice.ending_balance = Math.min(0, due);
  if (customer) customer.balance = invoice.ending_balance;
  invoice.number = `JB-FAKE-${String(++ctx.state.invoiceSeq).padStart(4, "0")}`;
  invoice.status = "open";
  invoice.status_transitions.finalized_at = invoice.effective_at = ctx.now();
  ctx.emit("invoice.finalized", invoice);
}

/** Tries to collect an open invoice; true when it ends up paid. */
export function attemptPayment(ctx: Ctx, invoice: Invoice): boolean {
  if (invoice.status !== "open") return invoice.status === "paid";
  if (invoice.amount_due > 0) {
    invoice.attempted = true;
    invoice.attempt_count += 1;
    if (consumeFailure(ctx, invoice.customer)) {
      ctx.emit("invoice.payment_failed", invoice);
      return false;
    }
  }
  invoice.status = "paid";
  invoice.amount_paid = invoice.amount_due;
  invoice.amount_remaining = 0;
  invoice.status_transitions.paid_at = ctx.now();
  ctx.emit("invoice.paid", invoice);
  return true;
}

/** True (and disarmed) when a test asked this customer's next payment to fail. */
export function consumeFailure(ctx: Ctx, customer: string): boolean {
  const at = ctx.state.failNext.indexOf(customer);
  if (at < 0) return false;
  ctx.state.failNext.splice(at, 1);
  return true;
}

export interface QuantityChange {
  quantity: number;
  behavior: "create_prorations" | "none" | "always_invoice";
  at: number;
}

/** The invoice the subscription would produce next, without creating it. */
export function previewInvoice(
  ctx: Ctx,
  sub: Subscription,
  change: QuantityChange | null,
): Invoice {
  const item = sub.items.data[0];
  const pending = pendingLines(ctx, sub);
  const proration =
    change && change.behavior !== "none"
      ? prorationLine(ctx, sub, change.quantity, change.at)
      : null;
  const extra = proration ? [proration] : [];
  if (change?.behavior === "always_invoice") {
    const now = ctx.now();
    const drafts = [...pending, ...extra];
    return preview(ctx, sub, "subscription_update", drafts, {
      start: now,
      end: now,
    });
  }
  if (
    sub.status === "canceled" ||
    (sub.cancel_at_period_end && !pending.length)
  )
    throw new StripeFakeError(
      400,
      "invalid_request_error",
      `No upcoming invoices for subscription: '${sub.id}'`,
      { code: "invoice_upcoming_none", param: "subscription" },
    );
  const start = item.current_period_end;
  const end = nextPeriodEnd(
    sub.billing_cycle_anchor,
    start,
    item.price.recurring!,
  );
  const next = cycleLine(ctx, sub, { start, end }, change?.quantity);
  const usage = { start: item.current_period_start, end: start };
  return preview(ctx, sub, "upcoming", [next, ...pending, ...extra], usage);
}

function preview(
  ctx: Ctx,
  sub: Subscription,
  reason: Invoice["billing_reason"],
  drafts: LineDraft[],
  usage: { start: number; end: number },
): Invoice {
  const invoice = invoiceObject(
    ctx,
    sub,
    reason,
    drafts,
    usage,
    newId("upcoming_in"),
  );
  const due = invoice.total + invoice.starting_balance;
  invoice.amount_due = invoice.amount_remaining = Math.max(0, due);
  invoice.ending_balance = Math.min(0, due);
  return invoice;
}
