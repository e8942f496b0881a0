// Maximum permissible error (MPE) of a complete heat meter, EN 1434-1 /
// MID (Directive 2014/32/EU) Annex VI MI-004, as a percentage of the true
// value, for accuracy classes 1, 2 and 3.
//
// Provenance (references.md §3):
// - E = E_f + E_t + E_c for every class [read: MID Annex VI point 3, which
//   takes E_f, E_t and E_c "according to points 7.1 to 7.3"].
// - The sub-assembly formulas below [memory: EN 1434-1, OIML R 75-1:2002,
//   MID Annex VI 7.1-7.3]; the class-2 E_f, E_t, E_c match a supplier's
//   EN 1434-1 data sheet [read]; the summed formulas for classes 1-3 match a
//   supplier page quoting CJ 128-2007, which mirrors EN 1434 [read].
// - Flow-sensor caps: 5 % for classes 2 and 3 [read: supplier technical
//   descriptions quoting EN 1434, "but not exceeding ±5 %"]; 3.5 % for class
//   1 [memory: EN 1434-1; MID may say 5 %]. The class-1 cap only bites at
//   q < qp/250, below any listed dynamic range, so the doubt does not matter
//   inside rated operating conditions. The cap is applied inside the sum
//   because MID point 3 builds E from the capped sub-assembly MPEs.

import { PhysicsRangeError, requireFinite, requirePositive } from "./errors";

export type MeterClass = 1 | 2 | 3;

export interface MpeInput {
  meterClass: MeterClass;
  /** |Θ_flow − Θ_return|, K. */
  deltaThetaK: number;
  /** Δθmin of the meter, K (MID: 3, 5 or 10 K). */
  deltaThetaMinK: number;
  /** Flow rate during the interval, m³/h. */
  flowM3PerH: number;
  /** Permanent flow rate qp of the flow sensor, m³/h. */
  qpM3PerH: number;
}

export interface MpeResult {
  flowSensorPercent: number;
  temperaturePairPercent: number;
  calculatorPercent: number;
  totalPercent: number;
}

// E_f = a + b·qp/q, capped (see provenance above).
const FLOW_SENSOR: Record<MeterClass, { a: number; b: number; cap: number }> = {
  1: { a: 1, b: 0.01, cap: 3.5 },
  2: { a: 2, b: 0.02, cap: 5 },
  3: { a: 3, b: 0.05, cap: 5 },
};

function requireInputs(input: MpeInput): void {
  if (!(input.meterClass in FLOW_SENSOR)) {
    throw new PhysicsRangeError(
      `${String(input.meterClass)} is not an EN 1434 accuracy class (1, 2 or 3)`,
      "meterClass",
    );
  }
  requirePositive("deltaThetaMinK", input.deltaThetaMinK);
  requirePositive("flowM3PerH", input.flowM3PerH);
  requirePositive("qpM3PerH", input.qpM3PerH);
  requireFinite("deltaThetaK", input.deltaThetaK);
  // Below Δθmin the meter is outside its rated operating conditions and the
  // standard states no MPE at all; we do not extrapolate one.
  if (input.deltaThetaK < input.deltaThetaMinK) {
    throw new PhysicsRangeError(
      `${input.deltaThetaK} K is below the meter's Δθmin of ` +
        `${input.deltaThetaMinK} K; the EN 1434 MPE applies only for ` +
        `Δθmin ≤ Δθ ≤ Δθmax`,
      "deltaThetaK",
    );
  }
}

/** EN 1434 / MID MI-004 MPE of a complete heat meter, in percent. */
export function heatMeterMpePercent(input: MpeInput): MpeResult {
  requireInputs(input);
  const f = FLOW_SENSOR[input.meterClass];
  const ratio = input.deltaThetaMinK / input.deltaThetaK;
  const ef = Math.min(f.a + (f.b * input.qpM3PerH) / input.flowM3PerH, f.cap);
  const et = 0.5 + 3 * ratio;
  const ec = 0.5 + ratio;
  return {
    flowSensorPercent: ef,
    temperaturePairPercent: et,
    calculatorPercent: ec,
    totalPercent: ef + et + ec,
  };
}

export interface MpeBand {
  energy: number;
  mpePercent: number;
  /** The half-width of the band, in the unit of `energy` (always ≥ 0). */
  plusMinus: number;
  low: number;
  high: number;
}

/** energy ± MPE, in the unit of `energy`; works for negative (cooling) too. */
export function mpeBand(energy: number, input: MpeInput): MpeBand {
  requireFinite("energy", energy);
  const mpePercent = heatMeterMpePercent(input).totalPercent;
  const plusMinus = (Math.abs(energy) * mpePercent) / 100;
  return {
    energy,
    mpePercent,
    plusMinus,
    low: energy - plusMinus,
    high: energy + plusMinus,
  };
}
