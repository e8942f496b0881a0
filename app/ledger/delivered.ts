/**
 * Two views of the same hours (design.md, "Delivered energy and the
 * thermodynamic view"), never mixed:
 *
 * - **Thermodynamic**: the stored intervals and rollups, and the site's
 *   energy balance. Heat and work are signed, into the site positive.
 *   Chilled water delivered to a site takes heat out of it, so a cooling
 *   import meter's hours are negative.
 * - **Delivered and exported by carrier**: the ledger, its exports, the
 *   Overview and the reports. What a site takes in is delivered (≥ 0), what
 *   it sends out is exported (≤ 0). Cooling delivered is a positive quantity
 *   of its own carrier. Unlike carriers are never added into one kWh figure.
 *
 * One view turns into the other by a sign per carrier: −1 for cooling, whose
 * delivery is heat leaving the site, +1 for every other carrier. The sign is
 * its own inverse. This module is the one place that says which carriers
 * turn; SQL and TypeScript both take it from here.
 */
import type { Carrier } from "~/sites/meter-kinds";

/** Carriers whose delivery is heat taken out of the site. */
const DELIVERED_AS_HEAT_OUT: readonly Carrier[] = ["cooling"];

/** The sign that turns a carrier's signed (into the site +) energy into delivered (+) or exported (−) energy, and back. */
export function deliveredSign(carrier: Carrier): 1 | -1 {
  return DELIVERED_AS_HEAT_OUT.includes(carrier) ? -1 : 1;
}

/**
 * The same sign in SQL, for an `energy_carrier` column or expression.
 * Multiplying a numeric by it keeps every stored digit, so figures derived
 * with it are still exact sums of their hours.
 */
export function deliveredSignSql(carrierColumn: string): string {
  const turned = DELIVERED_AS_HEAT_OUT.map((c) => `'${c}'`).join(", ");
  return `(case when ${carrierColumn} in (${turned}) then -1 else 1 end)`;
}
