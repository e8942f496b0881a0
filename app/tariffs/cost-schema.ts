/**
 * The cost fields every ledger row and total carries (docs/costs.md): money
 * as exact decimal text with its ISO 4217 currency. A plain module beside
 * app/ledger/ledger-schema.ts, which spreads these into its shapes.
 */
import { z } from "zod";

const money = (description: string) =>
  z
    .string()
    .regex(/^-?\d+(\.\d+)?$/)
    .describe(`${description}, exact decimal text in the currency`);

export const costFields = {
  cost: money(
    "What the row's supplies cost under their tariffs, VAT included (as closed, for a closed month); null: no tariff",
  ).nullable(),
  currency: z
    .string()
    .nullable()
    .describe("ISO 4217, e.g. GBP; null: no tariff"),
  adjustments_cost: money(
    "Cost changes since the month was closed (a tariff changed, or late energy)",
  ).nullable(),
};

export const carrierCostFields = {
  cost: money("The exact sum of the carrier's rows' cost").nullable(),
  currency: z
    .string()
    .nullable()
    .describe("The rows' currency; null when none has a tariff or they differ"),
};

export const costTotalSchema = z.strictObject({
  currency: z.string(),
  cost: money("The exact sum of the rows' cost in this currency"),
});
export type CostTotal = z.output<typeof costTotalSchema>;
