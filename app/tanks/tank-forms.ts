/**
 * The meter page's tank forms (settings, dip, delivery): the fields as typed,
 * turned into the API's bodies so that the page and the API are checked by
 * the same rules (tank-schema.ts, tanks.server.ts). Times are typed in UTC.
 */
import { z } from "zod";
import { optionalNumberField } from "~/lib/forms";
import { TANK_RANGES } from "./tank-balance";
import type {
  TankDeliveryBody,
  TankDipBody,
  TankSettingsBody,
} from "./tank-schema";

export const TANK_INTENTS = ["tank-settings", "tank-dip", "tank-delivery"];

const required = (label: string, min: number, max: number) =>
  optionalNumberField(label, min, max).refine((v) => v !== null, {
    message: `Enter the ${label.toLowerCase()}.`,
  });

/** A datetime-local value ("2026-03-02T08:00"), read as UTC. */
const utcTime = z
  .string()
  .trim()
  .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, "Enter a date and time (UTC).")
  .transform((v) => `${v}:00Z`);

const note = z.string().trim().max(200, "Use at most 200 characters.");

const { capacityL, densityKgL, calorificValueMjKg } = TANK_RANGES;

export const tankSettingsFormSchema = z.strictObject({
  intent: z.literal("tank-settings"),
  capacityL: required("Capacity", capacityL.min, capacityL.max),
  densityKgL: required("Density", densityKgL.min, densityKgL.max),
  calorificValueMjKg: required(
    "Calorific value",
    calorificValueMjKg.min,
    calorificValueMjKg.max,
  ),
  cvBasis: z.enum(["gross", "net"], { error: "Choose gross or net." }),
});

export const tankDipFormSchema = z.strictObject({
  intent: z.literal("tank-dip"),
  dippedAt: utcTime,
  stockL: required("Stock", 0, capacityL.max),
  note,
});

export const tankDeliveryFormSchema = z.strictObject({
  intent: z.literal("tank-delivery"),
  deliveredAt: utcTime,
  volumeL: required("Litres delivered", 0.001, capacityL.max),
  densityKgL: optionalNumberField("Density", densityKgL.min, densityKgL.max),
  calorificValueMjKg: optionalNumberField(
    "Calorific value",
    calorificValueMjKg.min,
    calorificValueMjKg.max,
  ),
  note,
});

export function settingsBody(
  f: z.output<typeof tankSettingsFormSchema>,
): TankSettingsBody {
  return {
    capacity_l: f.capacityL!,
    density_kg_l: f.densityKgL!,
    calorific_value_mj_kg: f.calorificValueMjKg!,
    cv_basis: f.cvBasis,
  };
}

export function dipBody(f: z.output<typeof tankDipFormSchema>): TankDipBody {
  return { time: f.dippedAt, stock_l: f.stockL!, note: f.note };
}

export function deliveryBody(
  f: z.output<typeof tankDeliveryFormSchema>,
): TankDeliveryBody {
  return {
    time: f.deliveredAt,
    volume_l: f.volumeL!,
    density_kg_l: f.densityKgL ?? undefined,
    calorific_value_mj_kg: f.calorificValueMjKg ?? undefined,
    note: f.note,
  };
}

/** The API's field names as the forms name them, for a refusal's place. */
export const formFieldOf: Record<string, string> = {
  time: "time",
  stock_l: "stockL",
  volume_l: "volumeL",
  capacity_l: "capacityL",
};
