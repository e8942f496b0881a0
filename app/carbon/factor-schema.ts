/**
 * Emission-factor sets and supply contracts as the API, the page and the CSV
 * upload take them, and as the API answers them. One set is one calendar
 * year's factors for one carrier, with the source they come from (required:
 * a factor without a source is refused). Plain module: the page reads it too.
 */
import { z } from "zod";
import { MONTH_PATTERN } from "~/lib/months";
import { storableText } from "~/lib/storable-text";
import { carrier, id } from "~/lib/wire-schemas";
import { isFuelCarrier, type Carrier } from "~/sites/meter-kinds";

/**
 * Fuels are burnt on site: scope 1. Electricity, heat, steam and cooling are
 * bought: scope 2 (docs/carbon.md).
 */
export function scopeOfCarrier(c: Carrier): 1 | 2 {
  return isFuelCarrier(c) ? 1 : 2;
}

export const FIRST_FACTOR_YEAR = 1990;
export const LAST_FACTOR_YEAR = 2100;
/** Factors above this are a typing error (kg CO₂e per kWh; coal is about 0.35). */
export const MAX_KG_PER_KWH = 10;

/** kg CO₂e per kWh as exact decimal text (a JSON number is taken too), ≤ 8 decimals. */
const factor = (label: string) =>
  z
    .union([z.string(), z.number()])
    .transform((v) => (typeof v === "number" ? String(v) : v.trim()))
    .pipe(
      z
        .string()
        .regex(
          /^\d+(\.\d{1,8})?$/,
          `${label}: a number ≥ 0 with up to 8 decimals.`,
        )
        .refine(
          (v) => Number(v) <= MAX_KG_PER_KWH,
          `${label}: at most ${MAX_KG_PER_KWH} kg CO₂e per kWh.`,
        ),
    )
    .describe(`${label}, kg CO₂e per kWh as decimal text`);

const optionalFactor = (label: string) =>
  z
    .union([factor(label), z.literal(""), z.null()])
    .optional()
    .transform((v) => (v === "" || v === undefined ? null : v));

/** One factor set as written: what the API body, the page's form and a CSV row carry. */
export const factorSetInputSchema = z
  .strictObject({
    year: z.coerce
      .number({ error: "The year: a whole number." })
      .int("The year: a whole number.")
      .min(FIRST_FACTOR_YEAR, `The year: from ${FIRST_FACTOR_YEAR}.`)
      .max(LAST_FACTOR_YEAR, `The year: up to ${LAST_FACTOR_YEAR}.`),
    carrier: z.enum(carrier.options, { error: "Choose a carrier." }),
    scope: z.coerce
      .number()
      .int()
      .optional()
      .describe(
        "1 for fuels, 2 for bought energy; taken from the carrier when left out",
      ),
    location_kg_per_kwh: factor("The location-based factor"),
    market_kg_per_kwh: optionalFactor("The market-based (residual mix) factor"),
    scope3_kg_per_kwh: optionalFactor("The scope 3 factor"),
    source: storableText(
      z
        .string({ error: "Name the source of the factors." })
        .trim()
        .min(1, "Name the source of the factors: a set without one is refused.")
        .max(300, "The source: at most 300 characters."),
      "source",
    ),
    version: storableText(
      z
        .string()
        .trim()
        .min(1, "Give the version of the source.")
        .max(60, "The version: at most 60 characters."),
      "version",
    ),
  })
  .superRefine((set, ctx) => {
    const expected = scopeOfCarrier(set.carrier);
    if (set.scope !== undefined && set.scope !== expected)
      ctx.addIssue({
        code: "custom",
        path: ["scope"],
        message: `${set.carrier} is scope ${expected}: fuels are scope 1, bought energy scope 2.`,
      });
  })
  .transform((set) => ({ ...set, scope: scopeOfCarrier(set.carrier) }));
export type FactorSetInput = z.output<typeof factorSetInputSchema>;

export const MAX_SETS_PER_UPLOAD = 500;

export const factorSetsBodySchema = z.strictObject({
  sets: z
    .array(factorSetInputSchema)
    .min(1, "Send at least one factor set.")
    .max(MAX_SETS_PER_UPLOAD)
    .describe(
      "Each set replaces the organisation's set for its year and carrier; all or none are stored",
    ),
});

const decimal = (description: string) =>
  z
    .string()
    .regex(/^\d+(\.\d+)?$/)
    .describe(description);

export const factorSetSchema = z.strictObject({
  id: id(),
  year: z.number().int(),
  carrier,
  scope: z.union([z.literal(1), z.literal(2)]),
  location_kg_per_kwh: decimal("kg CO₂e per kWh, location-based"),
  market_kg_per_kwh: decimal(
    "kg CO₂e per kWh, market-based residual mix",
  ).nullable(),
  scope3_kg_per_kwh: decimal("kg CO₂e per kWh, scope 3").nullable(),
  source: z.string(),
  version: z.string(),
  updated_at: z.string(),
});
export type FactorSet = z.output<typeof factorSetSchema>;

export const factorSetListSchema = z.strictObject({
  sets: z.array(factorSetSchema).describe("By year, then carrier"),
});

/** A supplier-specific or zero-carbon contract on one supply (a boundary meter). */
export const contractInputSchema = z
  .strictObject({
    meter_id: id(),
    name: storableText(
      z
        .string()
        .trim()
        .min(1, "Name the contract.")
        .max(120, "At most 120 characters."),
      "name",
    ),
    kg_per_kwh: factor("The contract's factor"),
    valid_from: z
      .string()
      .regex(MONTH_PATTERN, "The first month: like 2025-01."),
    valid_to: z
      .string()
      .regex(MONTH_PATTERN, "The last month: like 2025-12.")
      .nullable()
      .optional()
      .transform((v) => v ?? null),
  })
  .refine((c) => c.valid_to === null || c.valid_to >= c.valid_from, {
    path: ["valid_to"],
    message: "The last month comes before the first.",
  });
export type ContractInput = z.output<typeof contractInputSchema>;

export const contractSchema = z.strictObject({
  id: id(),
  meter_id: id(),
  meter_code: z.string(),
  name: z.string(),
  kg_per_kwh: decimal("kg CO₂e per kWh, market-based"),
  valid_from: z.string().regex(MONTH_PATTERN),
  valid_to: z.string().regex(MONTH_PATTERN).nullable(),
});
export type Contract = z.output<typeof contractSchema>;
export const contractListSchema = z.strictObject({
  contracts: z.array(contractSchema),
});
