/**
 * How an invoice stored from Stripe's events reads on the Billing page.
 *
 * Right after Checkout, Stripe announces the first invoice as a draft
 * (invoice.created: no number yet, nothing paid) a moment before it is
 * finalized and paid, and the events may reach us in that order with a page
 * view in between. A draft is shown as being prepared, not by Stripe's
 * internal id, "draft" and "£0.00 paid".
 */
import { dayUtc } from "~/lib/format";
import { formatMoney } from "./plan";

export interface StoredInvoice {
  id: string;
  number: string | null;
  status: string;
  currency: string;
  amountDue: number;
  amountPaid: number;
  hostedInvoiceUrl: string | null;
  createdAt: Date | string;
}

export type InvoiceTone = "neutral" | "spruce" | "copper" | "danger";

export interface InvoiceRow {
  id: string;
  /** The invoice number; a draft has none yet. */
  reference: string;
  issued: string;
  amount: string;
  /** What was paid, or "—" where nothing is payable yet (or any more). */
  paid: string;
  status: { label: string; tone: InvoiceTone };
  /** Stripe's page of the invoice, which exists once it is finalized. */
  link: string | null;
}

const STATUS: Record<string, InvoiceRow["status"]> = {
  draft: { label: "Being prepared", tone: "neutral" },
  open: { label: "Awaiting payment", tone: "copper" },
  paid: { label: "Paid", tone: "spruce" },
  uncollectible: { label: "Uncollectible", tone: "danger" },
  void: { label: "Void", tone: "neutral" },
};

/** Statuses in which nothing is, or is any longer, owed on the invoice. */
const NOTHING_PAYABLE = new Set(["draft", "void"]);

export function invoiceRow(invoice: StoredInvoice): InvoiceRow {
  const draft = invoice.status === "draft";
  return {
    id: invoice.id,
    reference: invoice.number ?? "Not numbered yet",
    issued: draft ? "—" : dayUtc(invoice.createdAt),
    amount: formatMoney(invoice.amountDue, invoice.currency),
    paid: NOTHING_PAYABLE.has(invoice.status)
      ? "—"
      : formatMoney(invoice.amountPaid, invoice.currency),
    status: STATUS[invoice.status] ?? {
      label: invoice.status,
      tone: "neutral",
    },
    link: draft ? null : invoice.hostedInvoiceUrl,
  };
}

/** Whether any invoice is still being prepared (the page explains it). */
export function anyBeingPrepared(invoices: readonly StoredInvoice[]): boolean {
  return invoices.some((i) => i.status === "draft");
}
