// Energy of a solid fuel burnt (biomass: logs, chips, pellets, straw), an
// extension of design.md's "Fuels, hydrogen and exergy" (docs/physics.md,
// "Solid fuel"):
//
//   E/kWh = m/kg × CV/(MJ/kg) / 3.6
//
// m is the mass as weighed (as received, water and all). The CV is stated
// either for that wet fuel (`as_received`, the default: what a pellet or
// chip supplier's note gives) or per kg of dry matter (`dry`, a laboratory
// figure), in which case the moisture content turns it into the as-received
// CV (EN ISO 18125's relations, with M the moisture in % of the wet mass):
//
//   gross:  q_gr,ar  = q_gr,d × (1 − M/100)
//   net:    q_net,ar = q_net,d × (1 − M/100) − 0.02443 × M
//
// The gross CV counts the water's latent heat as recovered, so wet fuel only
// dilutes it; the net CV loses the heat that evaporates the fuel's moisture,
// 2.443 MJ per kg of water (its enthalpy of vaporisation at 25 °C).
//
// A biomass boiler can also be accounted for by its heat output meter (a
// water heat meter on its flow) instead: that is heat delivered, not fuel,
// and no CV enters it.

import {
  PhysicsInputError,
  requireInRange,
  requireNonNegative,
} from "./errors";

/**
 * Ranges (common practice; typical values [memory]):
 * - CV 5–35 MJ/kg: from wet, freshly felled chips at about 55 % moisture
 *   (about 7 MJ/kg net as received) through logs and chips at 20–30 %
 *   (12–15), pellets (about 17 net, 19 gross), dry wood (about 19–20 gross)
 *   to charcoal (about 30). A CV in kWh/kg (about 4.8 for pellets) is
 *   refused, and so is one in GJ/t typed as MJ/kg only where it misfits.
 * - moisture 0–70 % of the wet mass: green wood is about 50–60 %; above
 *   70 % it does not burn unaided.
 */
export const SOLID_FUEL_RANGES = {
  calorificValueMjKg: { min: 5, max: 35 },
  moisturePercent: { min: 0, max: 70 },
} as const;

/** Enthalpy of vaporisation of water at 25 °C, MJ/kg (EN ISO 18125). */
export const WATER_VAPORISATION_MJ_KG = 2.443;

export type CvBasis = "gross" | "net";
/** Which mass the CV is per: the wet fuel as weighed, or its dry matter. */
export type CvMoistureBasis = "as_received" | "dry";

export interface SolidFuelInput {
  massKg: number;
  calorificValueMjKg: number;
  cvBasis: CvBasis;
  cvMoistureBasis: CvMoistureBasis;
  /** Required when the CV is on a dry basis; otherwise kept as stated. */
  moisturePercent?: number;
}

export interface SolidFuelResult {
  energyKwh: number;
  /** The CV per kg as weighed, MJ/kg. */
  asReceivedCvMjKg: number;
  /** The dry matter in the mass, kg, when the moisture is known. */
  dryMassKg: number | null;
}

/** The CV per kg of wet fuel from the CV per kg of its dry matter. */
export function asReceivedCv(
  dryCvMjKg: number,
  moisturePercent: number,
  basis: CvBasis,
): number {
  const wetShare = moisturePercent / 100;
  const diluted = dryCvMjKg * (1 - wetShare);
  return basis === "gross"
    ? diluted
    : diluted - WATER_VAPORISATION_MJ_KG * wetShare;
}

function moistureOf(input: SolidFuelInput): number | undefined {
  if (input.moisturePercent === undefined) {
    if (input.cvMoistureBasis === "dry") {
      throw new PhysicsInputError(
        "is required when the CV is per kg of dry matter (cv_moisture_basis dry)",
        "moisturePercent",
      );
    }
    return undefined;
  }
  return requireInRange(
    "moisturePercent",
    input.moisturePercent,
    SOLID_FUEL_RANGES.moisturePercent,
    "%",
  );
}

export function solidFuelEnergy(input: SolidFuelInput): SolidFuelResult {
  const massKg = requireNonNegative("massKg", input.massKg);
  requireInRange(
    "calorificValueMjKg",
    input.calorificValueMjKg,
    SOLID_FUEL_RANGES.calorificValueMjKg,
    "MJ/kg",
  );
  const moisture = moistureOf(input);
  const cv =
    input.cvMoistureBasis === "dry"
      ? asReceivedCv(input.calorificValueMjKg, moisture!, input.cvBasis)
      : input.calorificValueMjKg;
  if (cv <= 0) {
    // So wet that evaporating its water takes more than it gives: such fuel
    // does not burn unaided, and a negative energy is no reading.
    throw new PhysicsInputError(
      `at ${moisture} % moisture gives a net CV as received of ${cv} MJ/kg, ` +
        "not above 0: the fuel's water would take more heat than it gives",
      "moisturePercent",
    );
  }
  // 1 kWh = 3.6 MJ exactly (references.md §4).
  return {
    energyKwh: (massKg * cv) / 3.6,
    asReceivedCvMjKg: cv,
    dryMassKg: moisture === undefined ? null : massKg * (1 - moisture / 100),
  };
}
