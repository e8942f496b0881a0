/**
 * The wire and form shapes of budgets and the carbon target, checked with
 * zod at the API and the page alike. Plain module: the page reads it too.
 */
import { z } from "zod";
import { idSchema } from "~/lib/ids";
import { carriers } from "~/sites/meter-kinds";

const decimal = (places: number, what: string) =>
  z
    .string()
    .trim()
    .regex(
      new RegExp(`^\\d{1,15}(\\.\\d{1,${places}})?$`),
      `${what} is a decimal ≥ 0 with at most ${places} decimals, e.g. "1200.5".`,
    );

const financialYear = z
  .number()
  .int("A financial year is a whole year, e.g. 2025 for FY 2025/26.")
  .min(2000, "A financial year from 2000.")
  .max(2100, "A financial year up to 2100.");

const budgetFields = z.strictObject({
  site_id: idSchema("site_id is not an id."),
  carrier: z.enum(carriers),
  financial_year: financialYear.describe(
    "The calendar year the financial year starts in",
  ),
  energy_kwh: decimal(6, "energy_kwh"),
  amount: decimal(2, "amount").nullable().describe("Money; null: none"),
  currency: z
    .string()
    .regex(/^[A-Z]{3}$/, "currency is an ISO 4217 code, e.g. GBP.")
    .nullable(),
  spread: z.enum(["flat", "degree_days"]),
});

export const budgetInputSchema = budgetFields.refine(
  (b) => (b.amount === null) === (b.currency === null),
  {
    path: ["currency"],
    message: "A money budget needs its currency, and a currency its amount.",
  },
);
export type BudgetInput = z.output<typeof budgetInputSchema>;

export const budgetMonthSchema = z.strictObject({
  month: z.string(),
  energy_kwh: z.string(),
  amount: z.string().nullable(),
});

export const budgetSchema = budgetFields.extend({
  id: z.string(),
  site_name: z.string(),
  months: z
    .array(budgetMonthSchema)
    .describe("The spread: twelve months that add up to the budget exactly"),
});
export type Budget = z.output<typeof budgetSchema>;

export const budgetListSchema = z.strictObject({
  budgets: z.array(budgetSchema),
});

export const carbonTargetInputSchema = z
  .strictObject({
    base_year: financialYear,
    target_year: financialYear,
    reduction_percent: z
      .string()
      .trim()
      .regex(
        /^\d{1,3}(\.\d{1,2})?$/,
        "reduction_percent is a decimal, e.g. 10.",
      )
      .refine(
        (v) => Number(v) > 0 && Number(v) <= 100,
        "reduction_percent is above 0 and at most 100.",
      ),
    basis: z.enum(["location", "market"]),
  })
  .refine((t) => t.target_year > t.base_year, {
    path: ["target_year"],
    message: "The target year comes after the base year.",
  });
export type CarbonTargetInput = z.output<typeof carbonTargetInputSchema>;

export const carbonTargetSchema = z.strictObject({
  base_year: z.number().int(),
  target_year: z.number().int(),
  reduction_percent: z.string(),
  basis: z.enum(["location", "market"]),
});

export const carbonTargetReplySchema = z.strictObject({
  target: carbonTargetSchema.nullable(),
});

/** Form text to the API's shape: blanks are null, the year a number. */
function fromForm(values: unknown) {
  const v = { ...(values as Record<string, string>) };
  delete v.intent;
  const blankIsNull = (s: string | undefined) =>
    s === undefined || s.trim() === "" ? null : s.trim();
  return {
    ...v,
    financial_year: Number(v.financial_year),
    ...("amount" in v ? { amount: blankIsNull(v.amount) } : {}),
    ...("currency" in v ? { currency: blankIsNull(v.currency) } : {}),
    ...("base_year" in v ? { base_year: Number(v.base_year) } : {}),
    ...("target_year" in v ? { target_year: Number(v.target_year) } : {}),
  };
}

export const budgetFormSchema = z.preprocess(fromForm, budgetInputSchema);
export const carbonTargetFormSchema = z.preprocess((values) => {
  const { financial_year: _unused, ...rest } = fromForm(values);
  return rest;
}, carbonTargetInputSchema);
