import type { BillingOverview } from "~/billing/overview.server";
import { anyBeingPrepared, invoiceRow } from "~/billing/invoice-display";
import { SectionCard } from "~/components/section-card";
import { Badge, cx, EmptyState } from "~/components/ui";

const columns = [
  ["Invoice", ""],
  ["Issued", ""],
  ["Amount", "text-right"],
  ["Paid", "text-right"],
  ["Status", ""],
] as const;

/** Stripe's invoices, newest first, each with a link to Stripe's own page. */
export function InvoicesCard({
  invoices,
}: {
  invoices: BillingOverview["invoices"];
}) {
  const rows = invoices.map(invoiceRow);
  return (
    <SectionCard headingId="invoices-heading" title="Invoices">
      {rows.length === 0 ? (
        <div className="mt-3">
          <EmptyState title="No invoices yet">
            The first invoice arrives when you subscribe.
          </EmptyState>
        </div>
      ) : (
        <div className="mt-3 overflow-x-auto">
          <table className="w-full text-left">
            <thead className="text-sm text-ink-muted">
              <tr>
                {columns.map(([label, align]) => (
                  <th
                    key={label}
                    className={cx("py-1 pr-4", align, "font-semibold")}
                  >
                    {label}
                  </th>
                ))}
                <th className="py-1">
                  <span className="sr-only">Link</span>
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {rows.map((row) => (
                <tr key={row.id} data-invoice={row.id}>
                  <td className="py-2 pr-4 font-semibold">{row.reference}</td>
                  <td className="py-2 pr-4">{row.issued}</td>
                  <td className="py-2 pr-4 text-right">{row.amount}</td>
                  <td className="py-2 pr-4 text-right">{row.paid}</td>
                  <td className="whitespace-nowrap py-2 pr-4">
                    <Badge tone={row.status.tone}>{row.status.label}</Badge>
                  </td>
                  <td className="py-2 text-right">
                    {row.link ? (
                      <a
                        href={row.link}
                        className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                        rel="noreferrer"
                        target="_blank"
                      >
                        View
                      </a>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {anyBeingPrepared(invoices) ? (
            <p className="mt-2 text-sm text-ink-muted">
              Stripe is preparing an invoice: its number, and the payment, show
              here within a minute. Reload the page to see them.
            </p>
          ) : null}
        </div>
      )}
    </SectionCard>
  );
}
