/**
 * The one plan Joulebook sells, as plain values the billing page also needs.
 * Stripe holds the price object; these numbers create it and estimate bills
 * while no subscription exists yet.
 */
import { formatMoney as formatMoneyIn } from "~/lib/format";

/**
 * £29.00 per metered site per month, in pence (Stripe's minor units). A site
 * is metered once it has at least one active meter; changing this number
 * only affects prices created after it (see ensurePrice in stripe.server.ts).
 */
export const UNIT_PRICE_MINOR = 2900;
export const PRICE_CURRENCY = "gbp";
export const PRODUCT_NAME = "Joulebook metered site";

/** A subscription never drops below one site: an empty estate still pays the base seat. */
export function planQuantity(meteredSites: number): number {
  return Math.max(1, Math.floor(meteredSites));
}

/** What a month costs for this many metered sites, in minor units. */
export function monthlyEstimateMinor(meteredSites: number): number {
  return planQuantity(meteredSites) * UNIT_PRICE_MINOR;
}

/** Money in minor units, in the plan's currency unless another is given. */
export function formatMoney(minor: number, currency = PRICE_CURRENCY): string {
  return formatMoneyIn(minor, currency);
}
