import { day, siteCount } from "~/billing/billing-words";
import type { BillingOverview } from "~/billing/overview.server";
import { formatMoney, UNIT_PRICE_MINOR } from "~/billing/plan";
import { SectionCard } from "~/components/section-card";
import { BigFigure } from "./big-figure";

/** What the next invoice comes to: Stripe's preview, or sites × price. */
export function EstimateCard({
  estimate,
  account,
}: {
  estimate: BillingOverview["estimate"];
  account: BillingOverview["account"];
}) {
  return (
    <SectionCard
      headingId="estimate-heading"
      title="Next invoice"
      className="flex flex-col gap-3"
    >
      <BigFigure testId="estimate">
        {formatMoney(estimate.amountMinor, estimate.currency)}
      </BigFigure>
      <p className="text-sm text-ink-muted">
        {estimate.basis === "stripe"
          ? `Stripe's preview for ${day(estimate.dueOn)}, including any adjustment for sites added or removed during the month.`
          : `${siteCount(estimate.quantity)} × ${formatMoney(UNIT_PRICE_MINOR)}: what a month costs at today's count.`}
      </p>
      {account?.subscribed ? (
        <p className="mt-auto text-sm text-ink-muted">
          Stripe bills {siteCount(account.quantity)}; adding or retiring meters
          updates it, with the difference prorated.
        </p>
      ) : null}
    </SectionCard>
  );
}
