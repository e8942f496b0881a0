import { dayUtc } from "~/lib/format";
import { Link } from "react-router";

export interface BillingBannerData {
  kind: "trial" | "trial_ended" | "active" | "past_due" | "canceled";
  graceEndsAt: Date | null;
  sitesBlocked: boolean;
}

const headline: Record<string, string> = {
  past_due: "A payment for Joulebook is overdue.",
  trial_ended: "The free trial has ended.",
  canceled: "The subscription has ended.",
};

const remedy: Record<string, string> = {
  past_due: "Update the payment method to settle the open invoice.",
  trial_ended: "Subscribe to keep adding sites.",
  canceled: "Subscribe again to keep adding sites.",
};

/**
 * Shown to owners and finance on every organisation page while billing needs
 * them. It never hides data: readings keep arriving whatever it says.
 */
export function BillingBanner({
  billing,
  organizationId,
}: {
  billing: BillingBannerData | null;
  organizationId: string;
}) {
  if (!billing || !headline[billing.kind]) return null;
  const when = billing.graceEndsAt ? dayUtc(billing.graceEndsAt) : null;
  const consequence = billing.sitesBlocked
    ? "New sites cannot be added until it is settled."
    : when
      ? `From ${when}, new sites cannot be added until it is settled.`
      : "";
  return (
    <div
      role="status"
      aria-label="Billing"
      className="mb-6 flex flex-col gap-3 rounded-card border border-caution-700/30 bg-caution-50 px-5 py-4 text-caution-700 sm:flex-row sm:items-center sm:justify-between"
    >
      <div>
        <p className="font-semibold">{headline[billing.kind]}</p>
        <p className="mt-0.5">
          {consequence} {remedy[billing.kind]} Readings and stored data are not
          affected.
        </p>
      </div>
      <Link
        to={`/o/${organizationId}/billing`}
        className="inline-flex min-h-10 shrink-0 items-center justify-center rounded-lg bg-spruce-700 px-4 font-semibold text-white hover:bg-spruce-800"
      >
        Go to Billing
      </Link>
    </div>
  );
}
