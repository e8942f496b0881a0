/**
 * The Billing page's words for days, counts and a reconciliation's outcome.
 * Plain module: the page shows them, the action answers with them.
 */
import { dayUtc } from "~/lib/format";
import type { ReconcileOutcome } from "./reconcile.server";

/** A stored day, or a dash where there is none. */
export const day = (d: Date | string | null) => (d ? dayUtc(d) : "—");

export const daysLeft = (n: number) => `${n} day${n === 1 ? "" : "s"} left`;

/** "1 site", "3 sites". */
export const siteCount = (n: number | null) => `${n} site${n === 1 ? "" : "s"}`;

/** What a "Check now" found and did, in a sentence or two. */
export function describeReconcile(outcome: ReconcileOutcome): string {
  const linked = outcome.linked
    ? "Found a subscription in Stripe that had not reached Joulebook, and linked it. "
    : "";
  switch (outcome.result) {
    case "repaired":
      return `${linked}Stripe billed ${siteCount(outcome.found)}; it now bills ${outcome.expected}, the metered-site count.`;
    case "in_step":
      return `${linked}Stripe bills ${siteCount(outcome.expected)}, the same as the metered-site count.`;
    case "ended":
      return "The subscription has ended in Stripe, so nothing is billed. Subscribe again to restart the plan.";
    case "no_subscription":
      return "There is no subscription to check yet.";
    default:
      return "The payment service did not answer; nothing changed. Try again in a minute.";
  }
}

/** The action's answer, for the form that posted (`intent`). */
export type BillingActionResult = {
  intent: string;
  error?: string;
  message?: string;
};
