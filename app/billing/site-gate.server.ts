/**
 * Non-payment never blocks ingest or hides stored data; after the grace
 * period it only stops the estate from growing: new sites are refused.
 */
import { dayUtc } from "~/lib/format";
import { standingOf } from "./account.server";
import type { Standing } from "./standing";

function reason(standing: Standing): string {
  switch (standing.kind) {
    case "past_due":
      return "the subscription's payment is overdue";
    case "canceled":
      return "the subscription has ended";
    default:
      return "the free trial has ended without a subscription";
  }
}

/** Why a new site cannot be added now, or null when it can. */
export async function siteCreationRefusal(
  organizationId: string,
): Promise<string | null> {
  const standing = await standingOf(organizationId);
  if (!standing?.sitesBlocked) return null;
  const since = standing.graceEndsAt
    ? ` on ${dayUtc(standing.graceEndsAt)}`
    : "";
  return `New sites cannot be added: ${reason(standing)} and the grace period ended${since}. An owner or finance member can settle it on the Billing page. Readings keep arriving and nothing stored is lost.`;
}
