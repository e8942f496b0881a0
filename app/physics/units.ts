// Energy units as one table of factors to joules, each with its source
// (references.md §4). No unit library is installed, and the ones in common
// use differ on exactly the units that matter here: which Btu, and which
// therm (EC or US). One explicit table keeps every factor reviewable.

import { PhysicsInputError, requireFinite } from "./errors";

export interface EnergyUnitDefinition {
  joules: number;
  source: string;
}

// Exact by definition unless the source says otherwise.
const BTU_IT_J = 1055.05585262;
const KWH_J = 3.6e6;

export const ENERGY_UNITS = {
  J: { joules: 1, source: "SI derived unit (BIPM SI Brochure)" },
  kJ: { joules: 1e3, source: "SI prefix kilo" },
  MJ: { joules: 1e6, source: "SI prefix mega" },
  GJ: { joules: 1e9, source: "SI prefix giga" },
  Wh: { joules: 3600, source: "1 W·h = 3600 J (SI definitions)" },
  kWh: {
    joules: KWH_J,
    source: "3.6 MJ exactly: NIST SP 811 (2008) App. B.8; BS 350:2004",
  },
  MWh: { joules: 1e3 * KWH_J, source: "1000 kWh" },
  GWh: { joules: 1e6 * KWH_J, source: "10^6 kWh" },
  Btu: {
    joules: BTU_IT_J,
    source:
      "International Table Btu, 1055.055 852 62 J exactly: BS 350:2004 " +
      "note; NIST SP 811 B.8 footnote; = 4.1868 J/(g·K) × 453.592 37 g × 5/9",
  },
  MMBtu: { joules: 1e6 * BTU_IT_J, source: "10^6 Btu_IT (= 1 dekatherm EC)" },
  therm_ec: {
    joules: 1e5 * BTU_IT_J,
    source: "therm (EC) = 100 000 Btu_IT = 105.505 585 262 MJ (derived)",
  },
  therm_us: {
    joules: 105.4804e6,
    source:
      "therm (US) = 100 000 Btu_59°F = 105.4804 MJ: NIST SP 811 " +
      "1.054 804 E+08 J; US legal definition (1968)",
  },
} as const satisfies Record<string, EnergyUnitDefinition>;

export type EnergyUnit = keyof typeof ENERGY_UNITS;

export function isEnergyUnit(unit: string): unit is EnergyUnit {
  return Object.hasOwn(ENERGY_UNITS, unit);
}

function factor(unit: string, field: string): number {
  if (!isEnergyUnit(unit)) {
    const known = Object.keys(ENERGY_UNITS).join(", ");
    throw new PhysicsInputError(
      `unknown energy unit "${unit}"; use ${known}`,
      field,
    );
  }
  return ENERGY_UNITS[unit].joules;
}

/** Converts an energy between two units of the table. */
export function convertEnergy(
  value: number,
  from: EnergyUnit,
  to: EnergyUnit,
): number {
  requireFinite("value", value);
  if (from === to) return value;
  return (value * factor(from, "from")) / factor(to, "to");
}

export function kjToKwh(kj: number): number {
  return convertEnergy(kj, "kJ", "kWh");
}

export function kjToMj(kj: number): number {
  return convertEnergy(kj, "kJ", "MJ");
}
