/**
 * What a meter can be, one list each: the quantity it measures, the carrier it
 * accounts for, which way it faces across the site's boundary, where its flow
 * sensor sits. The database enums (`app/db/schema.ts`), the forms, the JSON
 * API and the pages all take their values from here, so adding a carrier is
 * one line below (plus its label and colour, which the types then ask for).
 * Plain module with relative imports: drizzle-kit loads the schema, and with
 * it this file, without the app's `~/` alias.
 */
import { QUANTITIES } from "../physics/evaluate-schema";

/** What a meter can measure: the quantities the physics core evaluates. */
export const quantities = QUANTITIES;
export type Quantity = (typeof quantities)[number];

export const quantityLabels: Record<Quantity, string> = {
  water_heat: "Water heat meter (volume, flow and return temperature)",
  steam_heat: "Steam meter (condensate mass, pressure)",
  sensible_heat: "Sensible heat, other media (mass, declared c)",
  electric_work: "Electrical work (volts, amps, power factor)",
  electric_register: "Electricity register (cumulative kWh)",
  heat_register: "Heat register (cumulative kWh)",
};

/** The energy carriers, in the order forms, filters and the ledger list them. */
export const carriers = ["heat", "cooling", "steam", "electricity"] as const;
export type Carrier = (typeof carriers)[number];

export const carrierLabels: Record<Carrier, string> = {
  heat: "Heat",
  cooling: "Cooling",
  steam: "Steam",
  electricity: "Electricity",
};

/**
 * The order of the report's carrier tables and the balance diagram: the
 * thermal carriers from hot to cold, then electricity.
 */
export const carrierReportOrder: readonly Carrier[] = [
  "heat",
  "steam",
  "cooling",
  "electricity",
];

/** Which carriers a quantity can account for. */
export const carriersFor: Record<Quantity, readonly Carrier[]> = {
  water_heat: ["heat", "cooling"],
  steam_heat: ["steam"],
  sensible_heat: ["heat", "cooling"],
  electric_work: ["electricity"],
  electric_register: ["electricity"],
  heat_register: ["heat", "cooling"],
};

/** Which way a meter faces: energy delivered to the site, or exported. */
export const orientations = ["import", "export"] as const;
export type Orientation = (typeof orientations)[number];

/** Which pipe a heat meter's flow sensor sits in. */
export const sensorPositions = ["flow", "return"] as const;
export type SensorPosition = (typeof sensorPositions)[number];

export function isCarrier(value: unknown): value is Carrier {
  return (
    typeof value === "string" && (carriers as readonly string[]).includes(value)
  );
}

/**
 * How long one of a meter's intervals is, in minutes: its intervals start on
 * multiples of it in UTC. Hourly is the default; suppliers' files are most
 * often half-hourly.
 */
export const intervalResolutions = [15, 30, 60] as const;
export type IntervalMinutes = (typeof intervalResolutions)[number];
export const DEFAULT_INTERVAL_MINUTES: IntervalMinutes = 60;

/** A resolution in plain words, as the meter page says it. */
export const resolutionWords: Record<IntervalMinutes, string> = {
  15: "Every 15 minutes",
  30: "Half-hourly",
  60: "Hourly",
};

/** Words for a stored resolution; an unknown one is said in minutes. */
export function resolutionLabel(minutes: number): string {
  return isIntervalMinutes(minutes)
    ? resolutionWords[minutes]
    : `Every ${minutes} minutes`;
}

export function isIntervalMinutes(value: unknown): value is IntervalMinutes {
  return (intervalResolutions as readonly unknown[]).includes(value);
}
