import { formatMoney, UNIT_PRICE_MINOR } from "~/billing/plan";
import { SectionCard } from "~/components/section-card";

/** Beside the payment card before a subscription: what subscribing means. */
export function TrialNote({ graceDays }: { graceDays: number }) {
  return (
    <SectionCard
      headingId="how-heading"
      title="How billing works"
      className="flex flex-col gap-2"
    >
      <ul className="list-disc space-y-1 pl-5 text-ink-muted">
        <li>
          Each month bills the sites with at least one active meter, at{" "}
          {formatMoney(UNIT_PRICE_MINOR)} each (at least one site).
        </li>
        <li>
          Adding or retiring meters changes the count; Stripe prorates the
          difference on the next invoice.
        </li>
        <li>
          If a payment fails, everything keeps working for {graceDays} days;
          after that only new sites are refused. Readings and stored data are
          never blocked.
        </li>
      </ul>
    </SectionCard>
  );
}
