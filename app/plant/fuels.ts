/**
 * The fuels a plant can burn or convert, with the two ratios the laws need:
 * net (lower) to gross (higher) calorific value, to put a stated efficiency
 * on one basis, and the fuel's maximum work (ΔG of its complete reaction at
 * 25 °C) to its gross energy, which bounds the electricity any engine or fuel
 * cell can make from it. Pure data and arithmetic: no database, no HTTP.
 *
 * Hydrogen and methane (standing in for natural gas) are computed from
 * formation enthalpies and entropies; the other fuels are mixtures with no
 * single reaction, so their ratios are the trade's usual figures, marked.
 */

export const fuels = [
  "natural_gas",
  "gas_oil",
  "kerosene",
  "lpg",
  "biomass",
  "hydrogen",
] as const;
export type Fuel = (typeof fuels)[number];

export type CvBasis = "gross" | "net";

/** 25 °C, the temperature of the standard formation values. */
export const STANDARD_TEMPERATURE_K = 298.15;

/**
 * Standard formation enthalpies (kJ/mol) and entropies (J/(mol·K)) of the
 * species in the two reactions computed here. CODATA key values (Cox, Wagman
 * & Medvedev 1989) for H₂O, H₂, O₂ and CO₂, as references.md §9 lists the
 * first four [memory]; methane's from the NIST Chemistry WebBook [memory].
 */
const FORMATION = {
  waterLiquid: { enthalpy: -285.83, entropy: 69.95 },
  waterVapour: { enthalpy: -241.826, entropy: 188.835 },
  hydrogen: { enthalpy: 0, entropy: 130.68 },
  oxygen: { enthalpy: 0, entropy: 205.152 },
  carbonDioxide: { enthalpy: -393.51, entropy: 213.785 },
  methane: { enthalpy: -74.87, entropy: 186.25 },
} as const;

type Species = keyof typeof FORMATION;

export interface Reaction {
  /** Stoichiometric amounts: reactants negative, products positive. */
  amounts: Partial<Record<Species, number>>;
}

/** H₂ + ½O₂ → H₂O(l): hydrogen's gross (higher) heat of reaction. */
export const HYDROGEN_TO_LIQUID_WATER: Reaction = {
  amounts: { hydrogen: -1, oxygen: -0.5, waterLiquid: 1 },
};
/** H₂ + ½O₂ → H₂O(g): its net (lower) heat of reaction. */
export const HYDROGEN_TO_WATER_VAPOUR: Reaction = {
  amounts: { hydrogen: -1, oxygen: -0.5, waterVapour: 1 },
};
/** CH₄ + 2O₂ → CO₂ + 2H₂O(l): methane burnt to liquid water. */
export const METHANE_TO_LIQUID_WATER: Reaction = {
  amounts: { methane: -1, oxygen: -2, carbonDioxide: 1, waterLiquid: 2 },
};
/** CH₄ + 2O₂ → CO₂ + 2H₂O(g). */
export const METHANE_TO_WATER_VAPOUR: Reaction = {
  amounts: { methane: -1, oxygen: -2, carbonDioxide: 1, waterVapour: 2 },
};

function sumOver(reaction: Reaction, property: "enthalpy" | "entropy"): number {
  let total = 0;
  for (const [species, amount] of Object.entries(reaction.amounts)) {
    total += amount * FORMATION[species as Species][property];
  }
  return total;
}

/** ΔH of the reaction at 25 °C, kJ/mol of fuel (negative: heat released). */
export function reactionEnthalpyKjPerMol(reaction: Reaction): number {
  return sumOver(reaction, "enthalpy");
}

/** ΔS of the reaction at 25 °C, J/(mol·K). */
export function reactionEntropyJPerMolK(reaction: Reaction): number {
  return sumOver(reaction, "entropy");
}

/** ΔG = ΔH − T·ΔS at 25 °C, kJ/mol: minus the most work the reaction can give. */
export function reactionGibbsKjPerMol(reaction: Reaction): number {
  return (
    reactionEnthalpyKjPerMol(reaction) -
    (STANDARD_TEMPERATURE_K * reactionEntropyJPerMolK(reaction)) / 1000
  );
}

function computedRatios(toLiquid: Reaction, toVapour: Reaction) {
  const gross = -reactionEnthalpyKjPerMol(toLiquid);
  return {
    netToGross: -reactionEnthalpyKjPerMol(toVapour) / gross,
    maxWorkToGross: -reactionGibbsKjPerMol(toLiquid) / gross,
  };
}

export interface FuelRatios {
  /** Net CV ÷ gross CV. */
  netToGross: number;
  /** Maximum work (|ΔG| at 25 °C) ÷ gross energy. */
  maxWorkToGross: number;
  source: string;
}

/**
 * Mixtures have no single ΔG; for them maximum work is taken as the gross
 * energy itself, a limit no engine reaches (their chemical exergy lies within
 * a few per cent of it, Szargut's tables [memory]), so the bound stays safe:
 * it may miss a small over-read but never flags a sound meter.
 */
export const FUEL_RATIOS: Record<Fuel, FuelRatios> = {
  natural_gas: {
    ...computedRatios(METHANE_TO_LIQUID_WATER, METHANE_TO_WATER_VAPOUR),
    source:
      "computed for methane from CODATA and NIST WebBook formation values [memory]; natural gas net ≈ 0.90 × gross (references.md §9, common practice)",
  },
  gas_oil: {
    netToGross: 0.94,
    maxWorkToGross: 1,
    source: "net ≈ 0.94 × gross (references.md §9) [memory, common practice]",
  },
  kerosene: {
    netToGross: 0.94,
    maxWorkToGross: 1,
    source: "as gas oil [memory, common practice]",
  },
  lpg: {
    netToGross: 0.92,
    maxWorkToGross: 1,
    source: "propane net ≈ 0.92 × gross [memory, common practice]",
  },
  biomass: {
    netToGross: 0.85,
    maxWorkToGross: 1,
    source:
      "wood fuels net ≈ 0.85–0.92 × gross depending on moisture; the lower end keeps the boiler bound safe [memory, common practice]",
  },
  hydrogen: {
    ...computedRatios(HYDROGEN_TO_LIQUID_WATER, HYDROGEN_TO_WATER_VAPOUR),
    source:
      "computed from CODATA key values (Cox, Wagman & Medvedev 1989; references.md §9)",
  },
};

/** A fuel energy stated on either basis, as gross energy. */
export function grossEnergyKwh(
  fuel: Fuel,
  energyKwh: number,
  basis: CvBasis,
): number {
  return basis === "gross"
    ? energyKwh
    : energyKwh / FUEL_RATIOS[fuel].netToGross;
}
