/**
 * The Carbon page's forms: one factor set typed in, a factor file, the
 * financial year's first month. Plain module: the page reads the words too.
 */
import { z } from "zod";
import { MONTH_NAMES } from "~/financial-year/financial-year";
import { FACTOR_COLUMNS } from "./factor-csv";

export const carbonIntents = [
  "save-set",
  "upload-sets",
  "financial-year",
] as const;
export type CarbonIntent = (typeof carbonIntents)[number];

export const factorSetFormFields = [
  "year",
  "carrier",
  "location_kg_per_kwh",
  "market_kg_per_kwh",
  "scope3_kg_per_kwh",
  "source",
  "version",
] as const;

export const financialYearFormSchema = z.strictObject({
  intent: z.literal("financial-year"),
  start_month: z.coerce
    .number({ error: "Choose a month." })
    .int()
    .min(1, "Choose a month.")
    .max(12, "Choose a month."),
});

export const monthChoices = MONTH_NAMES.map((name, i) => ({
  value: String(i + 1),
  label: name,
}));

export const FACTOR_FILE_HINT = `A CSV file with the columns ${FACTOR_COLUMNS.join(", ")}; market and scope 3 may be empty. All rows are stored or none.`;

export interface CarbonActionResult {
  intent: string;
  errors: Record<string, string>;
  problems?: { row: number; message: string }[];
  message?: string;
}
