/**
 * The wire shapes of a tank (docs/fuels-tanks.md, docs/api.md): its settings,
 * a dip and a delivery as the API and the meter page's forms send them, and
 * what the API answers. Litres and energies travel as exact decimal text.
 * The ranges that depend on the tank (a dip within its capacity) and on the
 * other entries (a consumption that is not negative) are checked when stored
 * (tanks.server.ts), with the field and the range in the reason.
 */
import { z } from "zod";
import { decimalKwh } from "~/lib/wire-schemas";
import { TANK_RANGES } from "./tank-balance";

const inRange = (
  description: string,
  range: { min: number; max: number },
  unit: string,
) =>
  z
    .number({ error: `expected a number of ${unit}` })
    .min(range.min, `must be ${range.min} ${unit} to ${range.max} ${unit}`)
    .max(range.max, `must be ${range.min} ${unit} to ${range.max} ${unit}`)
    .describe(`${description}, ${unit}: ${range.min} to ${range.max}`);

const instant = z.iso
  .datetime({ offset: true, error: "expected an ISO 8601 date-time" })
  .describe("ISO 8601 date-time with offset");

const note = z
  .string()
  .trim()
  .max(200, "at most 200 characters")
  .optional()
  .describe("A free note: who dipped, the delivery note's number …");

const litres = (description: string) =>
  z
    .string()
    .regex(/^\d+(\.\d+)?$/)
    .describe(`${description}, litres as exact decimal text`);

export const tankSettingsBodySchema = z.strictObject({
  capacity_l: inRange("Usable capacity", TANK_RANGES.capacityL, "l"),
  density_kg_l: inRange(
    "Declared density of the fuel, used where a delivery note gives none",
    TANK_RANGES.densityKgL,
    "kg/l",
  ),
  calorific_value_mj_kg: inRange(
    "Declared CV of the fuel, used where a delivery note gives none",
    TANK_RANGES.calorificValueMjKg,
    "MJ/kg",
  ),
  cv_basis: z
    .enum(["gross", "net"])
    .optional()
    .describe("Basis of the CVs: gross (default) or net"),
});
export type TankSettingsBody = z.output<typeof tankSettingsBodySchema>;

export const tankDipBodySchema = z.strictObject({
  time: instant.describe("When the tank was dipped"),
  stock_l: z
    .number({ error: "expected a number of litres" })
    .min(0, "must be 0 l or more")
    .describe("Stock in the tank, litres: 0 up to the tank's capacity_l"),
  note,
});
export type TankDipBody = z.output<typeof tankDipBodySchema>;

export const tankDeliveryBodySchema = z.strictObject({
  time: instant.describe("When the fuel was delivered"),
  volume_l: z
    .number({ error: "expected a number of litres" })
    .gt(0, "must be more than 0 l")
    .describe("Litres delivered: more than 0, up to the tank's capacity_l"),
  density_kg_l: inRange(
    "Density on the delivery note",
    TANK_RANGES.densityKgL,
    "kg/l",
  ).optional(),
  calorific_value_mj_kg: inRange(
    "CV on the delivery note",
    TANK_RANGES.calorificValueMjKg,
    "MJ/kg",
  ).optional(),
  note,
});
export type TankDeliveryBody = z.output<typeof tankDeliveryBodySchema>;

export const tankSchema = z.strictObject({
  meter_id: z.string(),
  capacity_l: litres("Usable capacity"),
  density_kg_l: z.string().describe("Declared density, kg/l"),
  calorific_value_mj_kg: z.string().describe("Declared CV, MJ/kg"),
  cv_basis: z.enum(["gross", "net"]),
});
export type ApiTank = z.output<typeof tankSchema>;

export const tankDipSchema = z.strictObject({
  time: z.iso.datetime(),
  stock_l: litres("Stock"),
  note: z.string(),
});

export const tankDeliverySchema = z.strictObject({
  id: z.string(),
  time: z.iso.datetime(),
  volume_l: litres("Delivered"),
  density_kg_l: z.string().nullable(),
  calorific_value_mj_kg: z.string().nullable(),
  note: z.string(),
});

export const tankPeriodSchema = z
  .strictObject({
    from: z.iso.datetime(),
    to: z.iso.datetime(),
    opening_stock_l: litres("Stock at the opening dip"),
    deliveries_l: litres(
      "Deliveries after the opening dip, up to the closing one",
    ),
    closing_stock_l: litres("Stock at the closing dip"),
    consumption_l: litres("opening + deliveries − closing"),
    density_kg_l: z.string(),
    calorific_value_mj_kg: z.string(),
    energy_kwh: decimalKwh(
      "L × ρ × CV / 3.6, to the µkWh: the sum of the meter's intervals from `from` to `to`",
    ),
  })
  .describe("The consumption between two consecutive dips");

export const tankDipListSchema = z.strictObject({
  tank: tankSchema,
  dips: z.array(tankDipSchema),
  periods: z.array(tankPeriodSchema),
});

export const tankDeliveryListSchema = z.strictObject({
  tank: tankSchema,
  deliveries: z.array(tankDeliverySchema),
});

/** What a POST of a dip or a delivery answers: the entry and the periods it changed. */
export const tankEntryAnswerSchema = z.strictObject({
  periods: z.array(tankPeriodSchema),
  adjustments: z
    .number()
    .int()
    .describe("Adjusting entries written for closed months"),
});
export type TankEntryAnswer = z.output<typeof tankEntryAnswerSchema>;
export type TankPeriodWire = z.output<typeof tankPeriodSchema>;

export const tankDeliveryAnswerSchema = tankEntryAnswerSchema.extend({
  id: z.string().describe("The delivery's id"),
});
