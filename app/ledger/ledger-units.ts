/**
 * The units the ledger is shown and exported in. Ledger figures are exact
 * decimal kWh (PostgreSQL numeric); each unit is defined here by its size in
 * MJ as an exact decimal, so the grid, the CSV and the XLSX file all convert
 * with the same factors (exact arithmetic in convert-energy-decimal.ts).
 * Plain module: the page and the server both read it.
 */
export const ledgerUnits = ["kWh", "MWh", "GJ", "therm", "MMBtu"] as const;
export type LedgerUnit = (typeof ledgerUnits)[number];

export function isLedgerUnit(value: string): value is LedgerUnit {
  return (ledgerUnits as readonly string[]).includes(value);
}

interface LedgerUnitDefinition {
  /** The unit's size in MJ, as an exact decimal. */
  megajoules: string;
  /** Where the factor comes from (references.md §4). */
  source: string;
  /**
   * Decimals shown: about the same resolution in every unit (0.1 kWh ≈
   * 0.0004 GJ) without a tail of noise digits; per m² figures are smaller.
   */
  decimals: { total: number; perM2: number };
}

export const LEDGER_UNITS: Record<LedgerUnit, LedgerUnitDefinition> = {
  kWh: {
    megajoules: "3.6",
    source: "1 kWh = 3.6 MJ exactly (NIST SP 811 (2008) App. B.8; BS 350:2004)",
    decimals: { total: 1, perM2: 2 },
  },
  MWh: {
    megajoules: "3600",
    source: "1 MWh = 1000 kWh = 3600 MJ exactly (SI prefix mega)",
    decimals: { total: 3, perM2: 5 },
  },
  GJ: {
    megajoules: "1000",
    source: "1 GJ = 1000 MJ exactly (SI prefix giga)",
    decimals: { total: 2, perM2: 4 },
  },
  therm: {
    // The EC therm, 100 000 Btu_IT = 105.505 585 262 MJ, rounded to four
    // decimals as UK and EU gas billing use it (29.3071 kWh per therm):
    // common practice. Not the US therm of 105.4804 MJ.
    megajoules: "105.5056",
    source:
      "1 therm = 105.5056 MJ (the EU/UK therm as gas billing uses it, 29.3071 kWh; common practice)",
    decimals: { total: 1, perM2: 3 },
  },
  MMBtu: {
    // 10^6 International Table Btu; 1 Btu_IT = 1055.055 852 62 J exactly.
    megajoules: "1055.05585262",
    source:
      "1 MMBtu = 10^6 Btu_IT = 1055.05585262 MJ exactly (International Table Btu: NIST SP 811 App. B.8 footnote; BS 350:2004)",
    decimals: { total: 2, perM2: 4 },
  },
};

/** The unit as a column heading shows it: "MWh", "MWh/m²". */
export function unitLabel(unit: LedgerUnit, perM2: boolean): string {
  return perM2 ? `${unit}/m²` : unit;
}
