/**
 * The JSON API's shapes for a gas supply's calorific values and its meter's
 * gas settings (app/api/gas-supply.server.ts). Plain module: the handlers
 * parse with them and the OpenAPI document is generated from them.
 */
import { z } from "zod";
import { idSchema } from "../lib/ids";
import {
  calorificValueInputSchema,
  cvBases,
  cvPeriodKinds,
  gasRegisterUnits,
  MAX_CV_ROWS,
} from "./calorific-values";
import { gasSettingsInputSchema } from "./gas-settings";

export { calorificValueInputSchema, gasSettingsInputSchema };

export const cvBatchSchema = z.strictObject({
  entries: z
    .array(calorificValueInputSchema)
    .min(1, "entries: at least one calorific value")
    .max(MAX_CV_ROWS, `entries: at most ${MAX_CV_ROWS} at once`),
});

/** One CV or a list of them (`{ entries: [...] }`), all stored or none. */
export const cvPostBodySchema = z
  .union([calorificValueInputSchema, cvBatchSchema])
  .meta({ id: "CalorificValueInput" });

export const cvPathSchema = z.strictObject({
  orgId: idSchema().describe("The organisation; another's answers 404"),
  meterId: idSchema().describe("A natural-gas meter"),
  period: z
    .string()
    .describe("The entry's period: 2026-03 (a month) or 2026-03-15 (a day)"),
});

export const storedCvSchema = z.strictObject({
  period: z.string().describe("2026-03 (a month) or 2026-03-15 (a day)"),
  period_kind: z.enum(cvPeriodKinds),
  calorific_value_mj_m3: z.number(),
  basis: z.enum(cvBases),
  source: z.string(),
  updated_at: z.string(),
});

export const gasSettingsSchema = z.strictObject({
  register_unit: z.enum(gasRegisterUnits).nullable(),
  correction_factor: z.number().nullable(),
  gas_temp_c: z.number().nullable(),
  gas_pressure_mbar_g: z.number().nullable(),
  atmospheric_pressure_mbar: z.number().nullable(),
  /** The factor the settings give (1: volumes already at 15 °C, 1013.25 mbar). */
  effective_correction_factor: z.number(),
});

export const cvListSchema = z.strictObject({
  meter_id: z.string(),
  calorific_values: z.array(storedCvSchema),
});

export const cvSaveAnswerSchema = cvListSchema.extend({
  saved: z.number().int(),
  intervals_repriced: z
    .number()
    .int()
    .describe("Intervals whose energy changed with the new values"),
});
