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
  gas_volume: "Gas meter (volume, calorific value)",
  liquid_fuel: "Liquid fuel (litres or tank stock, density, calorific value)",
  hydrogen: "Hydrogen (mass or normal volume)",
  solid_fuel: "Biomass by weight (mass, calorific value, moisture)",
};

/** The energy carriers, in the order forms, filters and the ledger list them. */
export const carriers = [
  "heat",
  "cooling",
  "steam",
  "electricity",
  // Fuels, named as app/plant/fuels.ts names them so that a meter's carrier
  // tells a plant which fuel it burns (fuelOfCarrier).
  "natural_gas",
  "gas_oil",
  "kerosene",
  "lpg",
  "biomass",
  "hydrogen",
] as const;
export type Carrier = (typeof carriers)[number];

/** A supply (a site and one carrier) as a map key, for figures read for many at once. */
export const siteCarrierKey = (siteId: string, carrier: string) =>
  `${siteId}|${carrier}`;

export const carrierLabels: Record<Carrier, string> = {
  heat: "Heat",
  cooling: "Cooling",
  steam: "Steam",
  electricity: "Electricity",
  natural_gas: "Natural gas",
  gas_oil: "Gas oil",
  kerosene: "Kerosene",
  lpg: "LPG",
  biomass: "Biomass",
  hydrogen: "Hydrogen",
};

/** A carrier as a sentence names it: "natural gas", "heat", but "LPG". */
export function carrierInText(carrier: Carrier): string {
  return carrierLabels[carrier].replace(/^[A-Z][a-z]/, (s) => s.toLowerCase());
}

/**
 * The order of the report's carrier tables and the balance diagram: the
 * thermal carriers from hot to cold, then electricity, then the fuels (the
 * gases, the liquids, the solid, hydrogen last).
 */
export const carrierReportOrder: readonly Carrier[] = [
  "heat",
  "steam",
  "cooling",
  "electricity",
  "natural_gas",
  "lpg",
  "gas_oil",
  "kerosene",
  "biomass",
  "hydrogen",
];

/** Which carriers a quantity can account for. */
export const carriersFor: Record<Quantity, readonly Carrier[]> = {
  water_heat: ["heat", "cooling"],
  steam_heat: ["steam"],
  sensible_heat: ["heat", "cooling"],
  electric_work: ["electricity"],
  electric_register: ["electricity"],
  heat_register: ["heat", "cooling"],
  // Natural gas only: LPG vapour's CV (about 95 MJ/m³) lies outside the
  // 10-60 MJ/m³ the quantity accepts, so LPG is metered as a liquid, and
  // hydrogen has its own quantity with its heat of reaction built in.
  // Biomass is weighed (solid_fuel); a biomass boiler can instead be
  // accounted for by the heat meter on its flow (water_heat, carrier heat).
  gas_volume: ["natural_gas"],
  liquid_fuel: ["gas_oil", "kerosene", "lpg"],
  hydrogen: ["hydrogen"],
  solid_fuel: ["biomass"],
};

/** Fuels: a site buys them, never exports them, so their meters import. */
export const fuelCarriers: readonly Carrier[] = [
  "natural_gas",
  "gas_oil",
  "kerosene",
  "lpg",
  "biomass",
  "hydrogen",
];

export function isFuelCarrier(carrier: Carrier): boolean {
  return fuelCarriers.includes(carrier);
}

/** Which way a meter faces: energy delivered to the site, or exported. */
export const orientations = ["import", "export"] as const;
export type Orientation = (typeof orientations)[number];

/**
 * Where a meter sits: on the site's boundary (what the site buys or sells:
 * its energy is delivered or exported), or inside it, on a plant's input or
 * output (a boiler's heat meter once its gas meter is on the boundary).
 * Internal meters keep their readings and feed the plant page, but no total
 * of delivered or exported energy counts them, or a boiler's heat would be
 * counted beside the gas it was made from.
 */
export const meterPositions = ["boundary", "internal"] as const;
export type MeterPosition = (typeof meterPositions)[number];

export const meterPositionLabels: Record<MeterPosition, string> = {
  boundary: "On the boundary",
  internal: "Inside the boundary",
};

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
