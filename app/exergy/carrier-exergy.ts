import type { Carrier } from "~/sites/meter-kinds";

/** A carrier's exergy in a site's month, as the site page shows it. */
export interface CarrierExergy {
  carrier: Carrier;
  /** kWh into the site (decimal string), or null when it cannot be had. */
  exergyKwh: string | null;
}
