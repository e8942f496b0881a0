// Energy of a metered natural-gas volume (design.md, "Fuels, hydrogen and
// exergy"; references.md §9):
//
//   V_ref = V × correction,  correction = (p_atm + p_g)/1013.25 × 288.15/(273.15 + t)
//   E/kWh = V_ref/m³ × CV/(MJ/m³) / 3.6
//
// The CV is stated at the reference conditions of EN ISO 13443 (15 °C,
// 1013.25 mbar) [memory], so the metered volume is first brought to them. The
// correction is the ideal-gas law with Z = 1, which is within a fraction of a
// per cent for natural gas below about 5 bar; above that a compressibility
// factor would be needed, so line pressures above 5 bar g are refused.

import {
  PhysicsInputError,
  PhysicsRangeError,
  requireFinite,
  requireInRange,
} from "./errors";
import { CELSIUS_OFFSET_K } from "./water-properties";

// 1 ft³ = (0.3048 m)³ exactly (international foot).
export const CUBIC_METRES_PER_CUBIC_FOOT = 0.028316846592;

// EN ISO 13443 reference conditions for gas volumes and CVs [memory].
export const GAS_REFERENCE_PRESSURE_MBAR = 1013.25;
export const GAS_REFERENCE_TEMPERATURE_K = 288.15;

export type CvBasis = "gross" | "net";

/**
 * The ranges a gas item must lie in. The reasons name them, so they are part
 * of the API's behaviour:
 * - CV 10–60 MJ/m³: issue #15. Natural gas is about 35–45 MJ/m³ (GB gross
 *   37.5–43 [memory]); the band leaves room for lean gases and blends but
 *   refuses e.g. a CV in Btu/ft³ (about 1000) or a mistyped decimal point.
 * - gas temperature −20 to 60 °C: below −20 °C is refused by issue #15;
 *   60 °C is above any gas meter's rated temperature (diaphragm and rotary
 *   meters are rated up to about 40–55 °C, common practice), so a higher
 *   figure is a sensor or unit fault (°F).
 * - gauge pressure 0 to 5000 mbar g: Z = 1 holds to about 5 bar (design.md);
 *   a gas meter below atmospheric pressure would draw air in.
 * - atmospheric pressure 700–1100 mbar: 700 hPa is the standard atmosphere
 *   at about 3000 m; sea-level records stay within 870–1084 hPa [memory].
 */
export const GAS_RANGES = {
  calorificValueMjM3: { min: 10, max: 60 },
  gasTempC: { min: -20, max: 60 },
  gasPressureMbarG: { min: 0, max: 5000 },
  atmosphericPressureMbar: { min: 700, max: 1100 },
} as const;

/** The ideal-gas correction from line conditions to 15 °C, 1013.25 mbar. */
export function gasCorrectionFactor(
  gasTempC: number,
  gasPressureMbarG: number,
  atmosphericPressureMbar = GAS_REFERENCE_PRESSURE_MBAR,
): number {
  const absoluteMbar = atmosphericPressureMbar + gasPressureMbarG;
  return (
    (absoluteMbar / GAS_REFERENCE_PRESSURE_MBAR) *
    (GAS_REFERENCE_TEMPERATURE_K / (CELSIUS_OFFSET_K + gasTempC))
  );
}

// The correction factor a caller may state directly is bounded by what the
// line-condition ranges above can produce, so both routes accept the same
// gas states (about 0.598 to 6.853).
export const CORRECTION_FACTOR_RANGE = {
  min: gasCorrectionFactor(
    GAS_RANGES.gasTempC.max,
    GAS_RANGES.gasPressureMbarG.min,
    GAS_RANGES.atmosphericPressureMbar.min,
  ),
  max: gasCorrectionFactor(
    GAS_RANGES.gasTempC.min,
    GAS_RANGES.gasPressureMbarG.max,
    GAS_RANGES.atmosphericPressureMbar.max,
  ),
} as const;

export interface LineConditions {
  gasTempC: number;
  gasPressureMbarG: number;
  atmosphericPressureMbar?: number;
}

export interface GasVolumeInput {
  /** Metered volume at line conditions, m³ (convert ft³ before). */
  volumeM3: number;
  calorificValueMjM3: number;
  /** A stated factor, or the line conditions, or neither (already at ref). */
  correctionFactor?: number;
  line?: LineConditions;
}

export interface GasVolumeResult {
  energyKwh: number;
  correctionFactor: number;
  volumeAtReferenceM3: number;
}

function checkedCorrection(input: GasVolumeInput): number {
  if (input.correctionFactor !== undefined && input.line !== undefined) {
    throw new PhysicsInputError(
      "give correction_factor or the line conditions (gas_temp_c, " +
        "gas_pressure_mbar_g), not both",
      "correctionFactor",
    );
  }
  if (input.correctionFactor !== undefined) {
    const r = CORRECTION_FACTOR_RANGE;
    const f = requireFinite("correctionFactor", input.correctionFactor);
    if (f < r.min || f > r.max) {
      throw new PhysicsRangeError(
        `${f} is outside ${r.min.toFixed(4)} to ${r.max.toFixed(4)}, the ` +
          "factors of the accepted line conditions (−20 to 60 °C, 0 to " +
          "5000 mbar g, 700 to 1100 mbar atmospheric)",
        "correctionFactor",
      );
    }
    return f;
  }
  if (input.line === undefined) return 1;
  const { gasTempC, gasPressureMbarG } = input.line;
  const atm = input.line.atmosphericPressureMbar ?? GAS_REFERENCE_PRESSURE_MBAR;
  requireInRange("gasTempC", gasTempC, GAS_RANGES.gasTempC, "°C");
  requireInRange(
    "gasPressureMbarG",
    gasPressureMbarG,
    GAS_RANGES.gasPressureMbarG,
    "mbar g",
  );
  requireInRange(
    "atmosphericPressureMbar",
    atm,
    GAS_RANGES.atmosphericPressureMbar,
    "mbar",
  );
  return gasCorrectionFactor(gasTempC, gasPressureMbarG, atm);
}

export function gasVolumeEnergy(input: GasVolumeInput): GasVolumeResult {
  requireFinite("volumeM3", input.volumeM3);
  if (input.volumeM3 < 0) {
    throw new PhysicsInputError(
      `must be zero or positive, got ${input.volumeM3}`,
      "volumeM3",
    );
  }
  requireInRange(
    "calorificValueMjM3",
    input.calorificValueMjM3,
    GAS_RANGES.calorificValueMjM3,
    "MJ/m³",
  );
  const correctionFactor = checkedCorrection(input);
  const volumeAtReferenceM3 = input.volumeM3 * correctionFactor;
  // 1 kWh = 3.6 MJ exactly (references.md §4).
  const energyKwh = (volumeAtReferenceM3 * input.calorificValueMjM3) / 3.6;
  return { energyKwh, correctionFactor, volumeAtReferenceM3 };
}
