import { day, daysLeft } from "~/billing/billing-words";
import type { BillingOverview } from "~/billing/overview.server";
import { formatMoney, UNIT_PRICE_MINOR } from "~/billing/plan";
import { Badge, Card } from "~/components/ui";

type Standing = BillingOverview["standing"];
type Account = BillingOverview["account"];

const standingLabels = {
  trial: { label: "Free trial", tone: "frost" },
  trial_ended: { label: "Trial ended", tone: "danger" },
  active: { label: "Active", tone: "spruce" },
  past_due: { label: "Past due", tone: "danger" },
  canceled: { label: "Cancelled", tone: "neutral" },
} as const;

/** Where the organisation stands, and what happens next, in words. */
function StandingText({
  standing,
  account,
}: {
  standing: Standing;
  account: Account;
}) {
  const grace = day(standing.graceEndsAt);
  switch (standing.kind) {
    case "trial":
      return (
        <>
          <p>
            Free until <strong>{day(standing.trialEndsAt)}</strong> (
            {daysLeft(standing.trialDaysLeft ?? 0)}). No card is needed during
            the trial.
          </p>
          <p className="mt-2 text-sm text-ink-muted">
            Subscribing ends the trial: the paid plan starts at once and the
            first month is charged on the day you subscribe.
          </p>
        </>
      );
    case "active":
      return account?.cancelAtPeriodEnd ? (
        <p>
          Paid up. The subscription was cancelled and ends on{" "}
          <strong>{day(account.currentPeriodEnd)}</strong>; nothing more will be
          charged.
        </p>
      ) : (
        <p>
          Paid monthly. The next period starts on{" "}
          <strong>{day(account?.currentPeriodEnd ?? null)}</strong>.
        </p>
      );
    case "past_due":
      return (
        <p>
          A renewal payment failed on {day(account?.pastDueSince ?? null)}.
          Stripe tries the card again over the coming days; update the payment
          method to settle it now.{" "}
          {standing.sitesBlocked
            ? "The grace period has ended, so new sites cannot be added until it is paid."
            : `New sites can be added until ${grace}.`}{" "}
          Readings keep arriving and nothing stored is lost.
        </p>
      );
    case "trial_ended":
      return (
        <p>
          The free trial ended on {day(standing.trialEndsAt)} without a
          subscription.{" "}
          {standing.sitesBlocked
            ? "The grace period has ended, so new sites cannot be added until you subscribe."
            : `New sites can be added until ${grace}; subscribe before then.`}{" "}
          Readings keep arriving and nothing stored is lost.
        </p>
      );
    default:
      return (
        <p>
          The subscription has ended.{" "}
          {standing.sitesBlocked
            ? "New sites cannot be added until you subscribe again."
            : `New sites can be added until ${grace}.`}{" "}
          Readings keep arriving and nothing stored is lost.
        </p>
      );
  }
}

/** The plan's price and the organisation's standing (trial, paid, past due…). */
export function PlanCard({
  standing,
  account,
}: {
  standing: Standing;
  account: Account;
}) {
  const badge = standingLabels[standing.kind];
  return (
    <Card aria-labelledby="plan-heading" className="flex flex-col gap-3">
      <div className="flex items-center justify-between gap-2">
        <h2 id="plan-heading" className="text-lg">
          Plan
        </h2>
        <Badge tone={badge.tone}>{badge.label}</Badge>
      </div>
      <p className="text-sm text-ink-muted">
        {formatMoney(UNIT_PRICE_MINOR)} per metered site per month
      </p>
      <StandingText standing={standing} account={account} />
    </Card>
  );
}
