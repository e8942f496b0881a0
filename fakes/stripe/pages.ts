/**
 * The fake's own HTML pages: the test payment page behind a Checkout
 * Session's url, the billing portal, and the hosted invoice page. They are
 * plainly labelled as local test pages and work without JavaScript.
 */
import { Router, type Response } from "express";
import { z } from "zod";
import { mustFind, type Ctx } from "./context";
import { StripeFakeError } from "./errors";
import {
  payCheckout,
  portalAction,
  refreshExpiry,
  type PortalAction,
} from "./checkout";
import { day, money, productName } from "./objects";
import type {
  CheckoutSession,
  Invoice,
  PortalSession,
  Subscription,
} from "./store";
import { payInvoice } from "./subscriptions";

const esc = (s: string | number | null | undefined) =>
  String(s ?? "").replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

const STYLE = `body{font:16px/1.5 system-ui,sans-serif;margin:0;background:#f4f6f4;color:#1d2a22}
.banner{background:#1d2a22;color:#fff;padding:.6rem 1rem;font-size:.9rem}
main{max-width:44rem;margin:2rem auto;background:#fff;padding:1.5rem 2rem;border:1px solid #cfd8d2;border-radius:6px}
table{border-collapse:collapse;width:100%;margin:1rem 0}th,td{text-align:left;padding:.4rem;border-bottom:1px solid #e2e8e4}
label{display:block;font-weight:600;margin-top:1rem}input{font:inherit;padding:.4rem;width:16rem}
button{font:inherit;padding:.4rem 1rem;margin:.3rem .3rem 0 0;cursor:pointer}
.error{color:#9b1c1c;font-weight:600}.notice{color:#1e5b34;font-weight:600}.hint{color:#55645a;font-size:.9rem}`;

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width,initial-scale=1"><title>${esc(title)} · local Stripe fake</title>
<style>${STYLE}</style></head><body>
<div class="banner" role="note">Local test page of Joulebook's Stripe fake. No real card is charged and no money moves.</div>
<main><h1>${esc(title)}</h1>${body}</main></body></html>`;
}

function send(res: Response, status: number, html: string) {
  res.status(status).type("html").send(html);
}

function checkoutPage(ctx: Ctx, session: CheckoutSession, error = ""): string {
  const plan = ctx.state.checkoutPlans[session.id];
  const price = ctx.state.prices.find((p) => p.id === plan.price)!;
  const total = money(price.unit_amount * plan.quantity, price.currency);
  const name = price.nickname ?? productName(ctx, price.product);
  if (session.status !== "open")
    return page(
      "Test payment page",
      `<p>This checkout session is ${esc(session.status)}.</p>`,
    );
  const trial = plan.trialDays
    ? `<p>Free trial of ${plan.trialDays} days, then ${esc(total)} per ${esc(price.recurring?.interval)}.</p>`
    : "";
  const cancel = session.cancel_url
    ? `<p><a href="${esc(session.cancel_url)}">Cancel and go back</a></p>`
    : "";
  return page(
    "Test payment page",
    `<table><thead><tr><th>Item</th><th>Quantity</th><th>Unit price</th><th>Total per ${esc(price.recurring?.interval)}</th></tr></thead>
<tbody><tr><td>${esc(name)}</td><td>${plan.quantity}</td><td>${esc(money(price.unit_amount, price.currency))}</td><td>${esc(total)}</td></tr></tbody></table>
${trial}${error ? `<p class="error" role="alert">${esc(error)}</p>` : ""}
<form method="post" action="/checkout/${esc(session.id)}/pay">
<label for="card_number">Card number</label>
<input id="card_number" name="card_number" value="4242 4242 4242 4242" inputmode="numeric" autocomplete="off">
<p class="hint">4242 4242 4242 4242 pays; 4000 0000 0000 0002 is declined.</p>
<button type="submit">${plan.trialDays ? "Start trial" : `Pay ${esc(total)}`}</button></form>${cancel}`,
  );
}

const NOTICES: Record<string, string> = {
  paid: "The invoice is paid.",
  declined: "The payment was declined; the invoice is still open.",
  cancel_at_period_end: "The subscription will end at the end of the period.",
  resume: "The subscription will renew again.",
  cancel_now: "The subscription is canceled.",
  not_open: "That invoice is no longer open.",
};

function subscriptionRow(
  ctx: Ctx,
  session: PortalSession,
  sub: Subscription,
): string {
  const item = sub.items.data[0];
  const live = sub.status !== "canceled" && sub.status !== "incomplete";
  const button = (action: PortalAction, label: string) =>
    `<form method="post" action="/portal/${esc(session.id)}/actions" style="display:inline">
<input type="hidden" name="action" value="${action}"><input type="hidden" name="target" value="${esc(sub.id)}">
<button type="submit">${label}</button></form>`;
  const actions = live
    ? (sub.cancel_at_period_end
        ? button("resume", "Resume subscription")
        : button("cancel_at_period_end", "Cancel at period end")) +
      button("cancel_now", "Cancel now")
    : "";
  const ends = sub.cancel_at_period_end ? " (ends then)" : "";
  return `<tr><td>${esc(productName(ctx, item.price.product))}</td><td>${esc(sub.status)}</td><td>${item.quantity}</td>
<td>${esc(day(item.current_period_end))}${ends}</td><td>${actions}</td></tr>`;
}

function invoiceRow(session: PortalSession, invoice: Invoice): string {
  const pay =
    invoice.status === "open"
      ? `<form method="post" action="/portal/${esc(session.id)}/actions" style="display:inline">
<input type="hidden" name="action" value="pay_invoice"><input type="hidden" name="target" value="${esc(invoice.id)}">
<button type="submit">Pay ${esc(money(invoice.amount_remaining, invoice.currency))}</button></form>`
      : "";
  return `<tr><td><a href="/invoices/${esc(invoice.id)}">${esc(invoice.number ?? invoice.id)}</a></td>
<td>${esc(day(invoice.created))}</td><td>${esc(money(invoice.total, invoice.currency))}</td><td>${esc(invoice.status)}</td><td>${pay}</td></tr>`;
}

function portalPage(
  ctx: Ctx,
  session: PortalSession,
  notice: string | undefined,
): string {
  const customer = ctx.state.customers.find((c) => c.id === session.customer);
  const subs = ctx.state.subscriptions
    .filter((s) => s.customer === session.customer)
    .reverse();
  const invoices = ctx.state.invoices
    .filter((i) => i.customer === session.customer)
    .reverse();
  const message =
    notice && NOTICES[notice]
      ? `<p class="notice" role="status">${esc(NOTICES[notice])}</p>`
      : "";
  const back = session.return_url
    ? `<p><a href="${esc(session.return_url)}">Return to Joulebook</a></p>`
    : "";
  return page(
    "Billing portal (test)",
    `<p>Customer: ${esc(customer?.name ?? customer?.email ?? session.customer)}</p>${message}
<h2>Subscriptions</h2><table><thead><tr><th>Plan</th><th>Status</th><th>Quantity</th><th>Period ends</th><th></th></tr></thead>
<tbody>${subs.map((s) => subscriptionRow(ctx, session, s)).join("") || '<tr><td colspan="5">None</td></tr>'}</tbody></table>
<h2>Invoices</h2><table><thead><tr><th>Number</th><th>Date</th><th>Total</th><th>Status</th><th></th></tr></thead>
<tbody>${invoices.map((i) => invoiceRow(session, i)).join("") || '<tr><td colspan="5">None</td></tr>'}</tbody></table>${back}`,
  );
}

function invoicePage(invoice: Invoice, notice: string | undefined): string {
  const rows = invoice.lines.data
    .map(
      (l) =>
        `<tr><td>${esc(l.description)}</td><td>${esc(day(l.period.start))} – ${esc(day(l.period.end))}</td><td>${esc(money(l.amount, l.currency))}</td></tr>`,
    )
    .join("");
  const pay =
    invoice.status === "open"
      ? `<form method="post" action="/invoices/${esc(invoice.id)}/pay"><button type="submit">Pay ${esc(money(invoice.amount_remaining, invoice.currency))}</button></form>`
      : "";
  const message =
    notice && NOTICES[notice]
      ? `<p class="notice" role="status">${esc(NOTICES[notice])}</p>`
      : "";
  return page(
    `Invoice ${invoice.number ?? invoice.id}`,
    `${message}<p>Status: <strong>${esc(invoice.status)}</strong> · Amount due ${esc(money(invoice.amount_due, invoice.currency))} · Paid ${esc(money(invoice.amount_paid, invoice.currency))}</p>
<table><thead><tr><th>Description</th><th>Period</th><th>Amount</th></tr></thead><tbody>${rows}</tbody></table>${pay}`,
  );
}

const portalForm = z.strictObject({
  action: z.enum([
    "cancel_at_period_end",
    "resume",
    "cancel_now",
    "pay_invoice",
  ]),
  target: z.string().min(1),
});

export function pageRoutes(ctx: Ctx): Router {
  const r = Router();
  const { state } = ctx;
  const session = (id: string) =>
    mustFind(state.checkoutSessions, id, "checkout.session");
  const portal = (id: string) =>
    mustFind(state.portalSessions, id, "billing_portal.session");
  const invoice = (id: string) => mustFind(state.invoices, id, "invoice");
  const notice = (q: unknown) => (typeof q === "string" ? q : undefined);

  r.get("/checkout/:id", (req, res) => {
    const s = session(req.params.id);
    refreshExpiry(ctx, s);
    send(res, 200, checkoutPage(ctx, s));
  });
  r.post("/checkout/:id/pay", (req, res) => {
    const s = session(req.params.id);
    const result = payCheckout(ctx, s, String(req.body?.card_number ?? ""));
    if (result.ok) res.redirect(303, result.redirect);
    else send(res, 402, checkoutPage(ctx, s, result.message));
  });
  r.get("/portal/:id", (req, res) => {
    send(
      res,
      200,
      portalPage(ctx, portal(req.params.id), notice(req.query.notice)),
    );
  });
  r.post("/portal/:id/actions", (req, res) => {
    const p = portalForm.safeParse(req.body);
    if (!p.success)
      throw new StripeFakeError(
        400,
        "invalid_request_error",
        "Unknown portal action.",
      );
    const done = portalAction(
      ctx,
      portal(req.params.id),
      p.data.action,
      p.data.target,
    );
    res.redirect(303, `/portal/${req.params.id}?notice=${done}`);
  });
  r.get("/invoices/:id", (req, res) => {
    send(
      res,
      200,
      invoicePage(invoice(req.params.id), notice(req.query.notice)),
    );
  });
  r.post("/invoices/:id/pay", (req, res) => {
    const inv = invoice(req.params.id);
    const done =
      inv.status !== "open"
        ? "not_open"
        : payInvoice(ctx, inv.id)
          ? "paid"
          : "declined";
    res.redirect(303, `/invoices/${inv.id}?notice=${done}`);
  });
  return r;
}
