/**
 * The money actual of a budget: the ledger's cost for a site, carrier and
 * period. ONE function, so the tariff work (which adds `cost` to the monthly
 * rollups) is wired in one place.
 *
 * This branch has no `cost` on the rollups yet, so it answers null and the
 * pages show the money actual as "no tariff yet". When the rollups carry
 * `cost`, sum it here for the site's boundary import meters of the carrier
 * over the months, the same way the ledger sums energy.
 */
export interface CostQuery {
  organizationId: string;
  siteId: string;
  carrier: string;
  /** First and last month, YYYY-MM, both included. */
  from: string;
  to: string;
}

export async function ledgerCost(_query: CostQuery): Promise<string | null> {
  return null;
}
