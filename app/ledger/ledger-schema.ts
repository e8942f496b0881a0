/**
 * The ledger's wire shape (`GET …/ledger`): what the domain's read returns
 * (ledger-rows.server.ts), the API answers and the grid shows.
 */
import { z } from "zod";
import { MONTH_PATTERN } from "~/lib/months";
import { carrier, decimalKg, decimalKwh, id } from "~/lib/wire-schemas";
import {
  costFields,
  costTotalSchema,
  carrierCostFields,
} from "~/tariffs/cost-schema";

/**
 * One site × month × carrier: delivered (imports, ≥ 0) and exported
 * (exports, ≤ 0) energy of that carrier. Chilled water is cooling delivered,
 * a positive figure.
 */
export const ledgerRowSchema = z.strictObject({
  site_id: id(),
  site_name: z.string(),
  floor_area_m2: z.string().nullable().describe("Decimal text, m²"),
  month: z.string().regex(MONTH_PATTERN),
  carrier,
  imports_kwh: decimalKwh("Delivered, ≥ 0"),
  exports_kwh: decimalKwh("Exported, ≤ 0"),
  net_kwh: decimalKwh("imports + exports"),
  estimated_kwh: decimalKwh("The estimated part"),
  estimated_share: z.number().describe("Estimated share of the energy, 0–1"),
  uncertainty_kwh: decimalKwh("EN 1434 band (heat and cooling)").nullable(),
  status: z.enum(["open", "closed"]),
  adjustments_kwh: decimalKwh("Changes since the month was closed"),
  adjustment_count: z.number().int(),
  closed_at: z
    .string()
    .nullable()
    .describe(
      "When a closed month was closed (ISO 8601); its adjusting entries are those since",
    ),
  exergy_kwh: decimalKwh(
    "Heat and cooling only: the exergy (work-equivalent) of the row's heat at each day's outdoor mean temperature as the dead state, into the site + (cooling delivered is +, exports −); null when any interval of the month lacks flow and return temperatures, is estimated or edited, or its day has no weather, and for other carriers",
  ).nullable(),
  co2e_kg: decimalKg(
    "Location-based CO₂e of the delivered energy (exports not netted off); null without a factor set for the carrier and year",
  ).nullable(),
  co2e_market_kg: decimalKg(
    "Market-based CO₂e: each supply's contract, else the set's residual mix, else its location-based factor",
  ).nullable(),
  co2e_adjustments_kg: decimalKg(
    "Location-based carbon changed since the month was closed (energy and factor changes)",
  ),
  co2e_market_adjustments_kg: decimalKg(
    "Market-based carbon changed since the month was closed",
  ),
  ...costFields,
});
export type LedgerRow = z.output<typeof ledgerRowSchema>;

/** One carrier's sums over every row: unlike carriers are never added. */
export const carrierTotalSchema = z.strictObject({
  carrier,
  imports_kwh: decimalKwh("Delivered"),
  exports_kwh: decimalKwh("Exported"),
  net_kwh: decimalKwh("Net"),
  co2e_kg: decimalKg("Σ of the rows' location-based CO₂e").nullable(),
  co2e_market_kg: decimalKg("Σ of the rows' market-based CO₂e").nullable(),
  ...carrierCostFields,
});
export type CarrierTotal = z.output<typeof carrierTotalSchema>;

export const ledgerSchema = z.strictObject({
  from: z.string().regex(MONTH_PATTERN),
  to: z.string().regex(MONTH_PATTERN),
  rows: z.array(ledgerRowSchema).describe("By site name, month, carrier"),
  totals: z
    .array(carrierTotalSchema)
    .describe("One per carrier in the rows, in carrier order"),
  carbon_total: z
    .strictObject({
      co2e_kg: decimalKg("Σ of every row's location-based CO₂e"),
      co2e_market_kg: decimalKg("Σ of every row's market-based CO₂e"),
      rows_without_factor: z
        .number()
        .int()
        .describe(
          "Rows left out of the sums: no factor set for their carrier and year",
        ),
    })
    .describe("Carbon across carriers: the exact sums of the rows"),
  cost_totals: z
    .array(costTotalSchema)
    .describe(
      "The cost of every row, across carriers, one per currency: the exact sums of the rows' cost",
    ),
});
export type Ledger = z.output<typeof ledgerSchema>;
