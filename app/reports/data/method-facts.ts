/**
 * The facts the method notes quote, taken from the modules that use them so
 * the report can never state a factor or threshold the app does not apply.
 * Pure.
 */
import { GUIDELINE_14 } from "~/baselines/regression";
import { RESIDUAL_TOLERANCE } from "~/ledger/balance";
import { ENERGY_UNITS, type EnergyUnit } from "~/physics/units";
import { STANDARD_ATMOSPHERE_BAR } from "~/physics/water-properties";
import type { MethodFacts } from "./types";

/** The units a reader may meet beside kWh, with the names printed for them. */
const UNITS: [EnergyUnit, string][] = [
  ["kWh", "kWh"],
  ["MWh", "MWh"],
  ["MJ", "MJ"],
  ["GJ", "GJ"],
  ["Btu", "Btu (IT)"],
  ["MMBtu", "MMBtu"],
  ["therm_ec", "therm (EC)"],
  ["therm_us", "therm (US)"],
];

export function methodFacts(
  sites: readonly { name: string; degreeDayBaseC: number }[],
): MethodFacts {
  const kwhJoules = ENERGY_UNITS.kWh.joules;
  return {
    unitFactors: UNITS.map(([unit, label]) => ({
      unit: label,
      kwh: ENERGY_UNITS[unit].joules / kwhJoules,
      source: ENERGY_UNITS[unit].source,
    })),
    degreeDayBases: sites.map((s) => ({
      siteName: s.name,
      baseC: s.degreeDayBaseC,
    })),
    guideline14: GUIDELINE_14,
    residualTolerance: RESIDUAL_TOLERANCE,
    gaugeOffsetBar: STANDARD_ATMOSPHERE_BAR,
  };
}
