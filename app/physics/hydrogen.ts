// Energy and maximum work of hydrogen (design.md, "Fuels, hydrogen and
// exergy"; references.md §9), from the CODATA key values (Cox, Wagman &
// Medvedev 1989) [memory]:
//
//   H₂(g) + ½ O₂(g) → H₂O(l)   ΔH = −285.830 kJ/mol (gross, higher)
//   H₂(g) + ½ O₂(g) → H₂O(g)   ΔH = −241.826 kJ/mol (net, lower)
//
// The most electrical work any fuel cell can get from it is |ΔG| at
// 298.15 K, ΔG = ΔH − T·ΔS with ΔS from the standard entropies; the rest of
// |ΔH| must leave as heat (T·|ΔS| at best). ΔS and ΔG are computed here
// from the tabulated values, not copied, so a wrong constant shows up in the
// test against the published −237.140 kJ/mol.

import { PhysicsInputError, requireNonNegative } from "./errors";

// J/(mol·K), exact since the 2019 SI (k_B × N_A).
export const MOLAR_GAS_CONSTANT = 8.314462618;
// g/mol, 2 × 1.00794 (references.md §9).
export const HYDROGEN_MOLAR_MASS_G_PER_MOL = 2.01588;
// Normal conditions for Nm³ (design.md): 0 °C, 101.325 kPa.
const NORMAL_TEMPERATURE_K = 273.15;
const NORMAL_PRESSURE_PA = 101325;
export const STANDARD_TEMPERATURE_K = 298.15;

// CODATA key values: enthalpies of formation of water, kJ/mol (those of H₂
// and O₂ are zero by definition); standard entropies, J/(mol·K).
export const CODATA = {
  formationEnthalpyWaterLiquidKjMol: -285.83,
  formationEnthalpyWaterVapourKjMol: -241.826,
  entropyWaterLiquidJMolK: 69.95,
  entropyHydrogenJMolK: 130.68,
  entropyOxygenJMolK: 205.152,
} as const;

export type HydrogenBasis = "gross" | "net";

/** ΔS of H₂ + ½O₂ → H₂O(l), J/(mol·K): products minus reactants. */
export function reactionEntropyJMolK(): number {
  const c = CODATA;
  return (
    c.entropyWaterLiquidJMolK -
    c.entropyHydrogenJMolK -
    0.5 * c.entropyOxygenJMolK
  );
}

/** ΔG = ΔH − T·ΔS of H₂ + ½O₂ → H₂O(l) at 298.15 K, kJ/mol. */
export function reactionGibbsEnergyKjMol(): number {
  const dS = reactionEntropyJMolK() / 1000;
  return CODATA.formationEnthalpyWaterLiquidKjMol - STANDARD_TEMPERATURE_K * dS;
}

export function heatingValueKjMol(basis: HydrogenBasis): number {
  const c = CODATA;
  return basis === "gross"
    ? -c.formationEnthalpyWaterLiquidKjMol
    : -c.formationEnthalpyWaterVapourKjMol;
}

/** Moles in a volume at 0 °C and 101.325 kPa, ideal gas (n = pV/RT). */
export function molesFromNormalVolume(volumeNm3: number): number {
  return (
    (NORMAL_PRESSURE_PA * volumeNm3) /
    (MOLAR_GAS_CONSTANT * NORMAL_TEMPERATURE_K)
  );
}

export interface HydrogenInput {
  massKg?: number;
  volumeNm3?: number;
  basis: HydrogenBasis;
}

export interface HydrogenResult {
  energyKwh: number;
  maxWorkKwh: number;
  moles: number;
  massKg: number;
  heatingValueKjMol: number;
  gibbsEnergyKjMol: number;
}

function molesOf(input: HydrogenInput): number {
  if (input.massKg !== undefined && input.volumeNm3 !== undefined) {
    throw new PhysicsInputError(
      "give mass_kg or volume_nm3, not both",
      "volumeNm3",
    );
  }
  if (input.massKg !== undefined) {
    requireNonNegative("massKg", input.massKg);
    return (input.massKg * 1000) / HYDROGEN_MOLAR_MASS_G_PER_MOL;
  }
  if (input.volumeNm3 === undefined) {
    throw new PhysicsInputError("is required, or volume_nm3", "massKg");
  }
  requireNonNegative("volumeNm3", input.volumeNm3);
  return molesFromNormalVolume(input.volumeNm3);
}

// kJ → kWh: 1 kWh = 3600 kJ exactly.
const KJ_PER_KWH = 3600;

export function hydrogenEnergy(input: HydrogenInput): HydrogenResult {
  const moles = molesOf(input);
  const hv = heatingValueKjMol(input.basis);
  const dG = reactionGibbsEnergyKjMol();
  // The work limit does not depend on the basis: the basis only says how the
  // fuel's energy is counted, not what the fuel cell can do with it.
  return {
    energyKwh: (moles * hv) / KJ_PER_KWH,
    maxWorkKwh: (moles * Math.abs(dG)) / KJ_PER_KWH,
    moles,
    massKg: (moles * HYDROGEN_MOLAR_MASS_G_PER_MOL) / 1000,
    heatingValueKjMol: hv,
    gibbsEnergyKjMol: dG,
  };
}
