import { describe, expect, it } from "vitest";
import { invoiceRow, type StoredInvoice } from "./invoice-display";

// The first invoice as Stripe announces it right after Checkout
// (invoice.created), then as it ends up (invoice.paid).
const draft: StoredInvoice = {
  id: "in_1QxFakeInternalId",
  number: null,
  status: "draft",
  currency: "gbp",
  amountDue: 2900,
  amountPaid: 0,
  hostedInvoiceUrl: "http://127.0.0.1:4242/invoices/in_1QxFakeInternalId",
  createdAt: "2026-03-01T10:00:00Z",
};
const paid: StoredInvoice = {
  ...draft,
  number: "JB-FAKE-0001",
  status: "paid",
  amountPaid: 2900,
};

describe("invoice rows on the Billing page", () => {
  it("a draft reads as being prepared: no internal id, nothing paid yet, no link", () => {
    const row = invoiceRow(draft);
    expect(row.reference).toBe("Not numbered yet");
    const shown = [row.reference, row.issued, row.amount, row.paid];
    expect(shown.join(" ")).not.toContain("in_");
    expect(row.status).toEqual({ label: "Being prepared", tone: "neutral" });
    expect(row.paid).toBe("—");
    expect(row.issued).toBe("—");
    expect(row.link).toBeNull();
    expect(row.amount).toBe("£29.00");
  });

  it("the paid invoice shows its number, date, amounts and link", () => {
    expect(invoiceRow(paid)).toEqual({
      id: draft.id,
      reference: "JB-FAKE-0001",
      issued: "1 Mar 2026",
      amount: "£29.00",
      paid: "£29.00",
      status: { label: "Paid", tone: "spruce" },
      link: draft.hostedInvoiceUrl,
    });
  });

  it("an open invoice shows what is still unpaid; a void one nothing payable", () => {
    const open = invoiceRow({ ...paid, status: "open", amountPaid: 0 });
    expect(open.status.label).toBe("Awaiting payment");
    expect(open.paid).toBe("£0.00");
    expect(invoiceRow({ ...paid, status: "void", amountPaid: 0 }).paid).toBe(
      "—",
    );
  });
});
