// Sensible heat of a medium other than water (glycol, thermal oil...) with a
// declared specific heat: Q = m · c · (t_in − t_out). The declared c stands
// for the mean over the temperature span; positive Q is heat given up by the
// medium to the load between inlet and outlet.

import {
  PhysicsRangeError,
  requireFinite,
  requireNonNegative,
  requirePositive,
} from "./errors";

export interface SensibleHeatInput {
  massKg: number;
  specificHeatKjPerKgK: number;
  inletTempC: number;
  outletTempC: number;
}

// Nothing is colder than absolute zero; a temperature below it is a unit or
// sign error in the reading, not a cold medium.
const ABSOLUTE_ZERO_C = -273.15;

function requireTemperatureC(field: string, tC: number): void {
  requireFinite(field, tC);
  if (tC < ABSOLUTE_ZERO_C) {
    throw new PhysicsRangeError(
      `${tC} °C is below absolute zero (${ABSOLUTE_ZERO_C} °C)`,
      field,
    );
  }
}

export function sensibleHeatKj(input: SensibleHeatInput): number {
  requireNonNegative("massKg", input.massKg);
  requirePositive("specificHeatKjPerKgK", input.specificHeatKjPerKgK);
  requireTemperatureC("inletTempC", input.inletTempC);
  requireTemperatureC("outletTempC", input.outletTempC);
  const dT = input.inletTempC - input.outletTempC;
  return input.massKg * input.specificHeatKjPerKgK * dT;
}
