/**
 * What a tariff and its versions are on the wire and in the forms. Rates are
 * decimal text (never doubles) and must not be negative; the band set must
 * cover every quarter hour of the week exactly once (band-week.ts). A plain
 * module: the API, the page's forms and the domain read the same schemas.
 */
import { z } from "zod";
import { carrier, id } from "~/lib/wire-schemas";
import { bandWeek } from "./band-week";

const DECIMAL = /^-?\d{1,12}(\.\d{1,10})?$/;

/** A non-negative rate as decimal text, e.g. "0.2812". */
export const rate = (what: string) =>
  z
    .string()
    .trim()
    .regex(DECIMAL, `${what}: a number such as 0.2812`)
    .refine((v) => !v.startsWith("-"), `${what} must not be negative`)
    .describe(`${what}, exact decimal text, ≥ 0`);

const DAY = /^\d{4}-\d{2}-\d{2}$/;
const day = (what: string) =>
  z
    .string()
    .regex(DAY, `${what}: a day as YYYY-MM-DD`)
    .refine(
      (v) =>
        !Number.isNaN(Date.parse(`${v}T00:00:00Z`)) &&
        new Date(`${v}T00:00:00Z`).toISOString().startsWith(v),
      `${what}: no such day`,
    );

export const bandSchema = z.strictObject({
  name: z.string().trim().min(1, "Name the band").max(40),
  rate_per_kwh: rate("Unit rate per kWh"),
  windows: z
    .string()
    .trim()
    .min(1, "Give the band's windows, e.g. Mon-Fri 07:00-23:00")
    .max(400)
    .describe(
      'Local-time windows separated by ";", e.g. "Mon-Fri 07:00-23:00; Sat-Sun 09:00-12:00". A window ending at or before its start runs past midnight. Quarter hours only.',
    ),
});

export const levySchema = z.strictObject({
  name: z.string().trim().min(1, "Name the levy").max(60),
  rate_per_kwh: rate("Levy per kWh"),
});

/** The rates of one version: everything that prices a month of a supply. */
export const tariffRatesSchema = z
  .strictObject({
    bands: z
      .array(bandSchema)
      .min(1, "A tariff needs at least one time band")
      .max(12),
    standing_charge_per_day: rate("Standing charge per day"),
    capacity_charge_per_day: rate("Capacity charge per day").default("0"),
    max_demand_rate_per_kw_month: rate(
      "Maximum-demand charge per kW per month",
    ).default("0"),
    levies: z.array(levySchema).max(8).default([]),
    export_rate_per_kwh: rate("Export rate per kWh")
      .nullable()
      .default(null)
      .describe(
        "Paid for exported energy; null: exported energy is not credited",
      ),
    vat_percent: rate("VAT %").refine(
      (v) => Number(v) <= 100,
      "VAT % must be at most 100",
    ),
  })
  .superRefine((rates, ctx) => {
    const week = bandWeek(
      rates.bands.map((b) => ({ name: b.name, windows: b.windows })),
    );
    if (!week.ok)
      ctx.addIssue({ code: "custom", path: ["bands"], message: week.reason });
    const names = rates.bands.map((b) => b.name.toLowerCase());
    if (new Set(names).size !== names.length)
      ctx.addIssue({
        code: "custom",
        path: ["bands"],
        message: "Each band needs its own name",
      });
  });
export type TariffRates = z.output<typeof tariffRatesSchema>;

export const tariffVersionInputSchema = z
  .strictObject({
    valid_from: day("Valid from"),
    valid_to: day("Valid to")
      .nullable()
      .default(null)
      .describe("The last day included; null: until further notice"),
    rates: tariffRatesSchema,
  })
  .refine((v) => v.valid_to === null || v.valid_to >= v.valid_from, {
    path: ["valid_to"],
    message: "Valid to must not be before valid from",
  });
export type TariffVersionInput = z.output<typeof tariffVersionInputSchema>;

export const tariffInputSchema = z.strictObject({
  name: z.string().trim().min(1, "Name the tariff").max(120),
  site_id: id(),
  carrier,
  meter_id: id()
    .nullable()
    .default(null)
    .describe("One meter's tariff; null: the site's supply of the carrier"),
  currency: z
    .string()
    .regex(/^[A-Z]{3}$/, "Currency: three capital letters, e.g. GBP"),
  illustrative: z.boolean().default(false),
  first_version: tariffVersionInputSchema,
});
export type TariffInput = z.output<typeof tariffInputSchema>;

export const tariffVersionSchema = z.strictObject({
  id: id(),
  valid_from: z.string(),
  valid_to: z.string().nullable(),
  rates: tariffRatesSchema,
  created_at: z.string(),
});

export const tariffSchema = z.strictObject({
  id: id(),
  name: z.string(),
  site_id: id(),
  site_name: z.string(),
  carrier,
  meter_id: id().nullable(),
  meter_code: z.string().nullable(),
  currency: z.string(),
  illustrative: z.boolean(),
  versions: z.array(tariffVersionSchema).describe("Oldest first"),
});
export type Tariff = z.output<typeof tariffSchema>;

export const tariffListSchema = z.strictObject({
  tariffs: z.array(tariffSchema),
});
export type TariffList = z.output<typeof tariffListSchema>;
