// Meter-facing water and steam properties: IAPWS-IF97 (see if97.ts) behind a
// range and phase guard sized to what heat and steam meters meet. Inputs are
// in the units gateways send (bar, °C); a value outside the range, or in the
// wrong phase, throws a PhysicsRangeError naming the valid range instead of
// returning an extrapolated number.

import { PhysicsRangeError, requireFinite } from "./errors";
import {
  IF97_SATURATION_MIN_PRESSURE_MPA,
  region1LiquidPairInRange,
  region1Properties,
  region1PropertiesInRange,
  region2Properties,
  saturationPressureInRangeMpa,
  saturationPressureMpa,
  saturationTemperatureK,
} from "./if97";
import type { LiquidPair, WaterProperties } from "./if97";

export type { LiquidPair, WaterProperties } from "./if97";

// Heating, chilled-water and process-steam meters: 0-250 °C for the
// temperatures their sensors measure in water, 0.006-40 bar a for pressures.
// 0.006 bar a reaches down to the triple point (611.657 Pa [memory]).
// Saturated steam is bounded by the pressure range alone (SATURATION_RANGE).
export const METER_RANGE = {
  minTemperatureC: 0,
  maxTemperatureC: 250,
  minPressureBarAbs: 0.006,
  maxPressureBarAbs: 40,
} as const;

// The standard atmosphere, used to turn gauge into absolute pressure (common
// practice; a site may use its local barometric pressure instead).
export const STANDARD_ATMOSPHERE_BAR = 1.01325;

// T/K = t/°C + 273.15 exactly (the kelvin and degree Celsius definitions).
export const CELSIUS_OFFSET_K = 273.15;

// p_s(0 °C) = 611.213 Pa: the saturation line (IF97 region 4) ends there, so
// a saturation state needs at least this pressure.
const SATURATION_MIN_PRESSURE_BAR = IF97_SATURATION_MIN_PRESSURE_MPA * 10;

// Same rounding allowance as if97.ts for states exactly on the saturation line.
const SATURATION_RELATIVE_TOLERANCE = 1e-9;

/**
 * Saturated steam within the meter's pressure range. Pressure and saturation
 * temperature are two names for one state, so the temperature range is the
 * pressure range carried through the saturation curve (IF97 region 4,
 * Eq. 31), not the 0-250 °C of water sensors: from 0 °C, where the line starts
 * at 0.00611213 bar a, to T_s(40 bar a) = 250.3575 °C [computed, IF97
 * Eq. 31; steam tables print 250.35-250.36 °C at 40 bar, memory]. Either name
 * for the state is accepted over exactly the same states.
 */
export const SATURATION_RANGE = {
  minPressureBarAbs: SATURATION_MIN_PRESSURE_BAR,
  maxPressureBarAbs: METER_RANGE.maxPressureBarAbs,
  minTemperatureC: 0,
  maxTemperatureC:
    saturationTemperatureK(METER_RANGE.maxPressureBarAbs / 10) -
    CELSIUS_OFFSET_K,
} as const;

export interface FieldNames {
  pressure?: string;
  temperature?: string;
}

export function absolutePressureBar(gaugePressureBar: number): number {
  return gaugePressureBar + STANDARD_ATMOSPHERE_BAR;
}

function range(min: number, max: number, unit: string): string {
  return `${min} ${unit} to ${max} ${unit}`;
}

export function requireMeterPressureBar(field: string, pBarAbs: number): void {
  requireFinite(field, pBarAbs);
  const { minPressureBarAbs: min, maxPressureBarAbs: max } = METER_RANGE;
  if (pBarAbs < min || pBarAbs > max) {
    throw new PhysicsRangeError(
      `${pBarAbs} bar a is outside the meter range ${range(min, max, "bar a")}`,
      field,
    );
  }
}

export function requireMeterTemperatureC(field: string, tC: number): void {
  requireFinite(field, tC);
  const { minTemperatureC: min, maxTemperatureC: max } = METER_RANGE;
  if (tC < min || tC > max) {
    throw new PhysicsRangeError(
      `${tC} °C is outside the meter range ${range(min, max, "°C")}`,
      field,
    );
  }
}

function mpa(pBar: number): number {
  return pBar / 10;
}

function round(value: number, digits: number): number {
  return Number(value.toFixed(digits));
}

// The meter-range checks that liquid and steam share, then p_s(t) in bar a
// for the caller's phase test.
function meterSaturationBar(
  pressureBarAbs: number,
  temperatureC: number,
  fields: FieldNames,
): number {
  requireMeterPressureBar(fields.pressure ?? "pressureBarAbs", pressureBarAbs);
  requireMeterTemperatureC(fields.temperature ?? "temperatureC", temperatureC);
  return saturationPressureMpa(temperatureC + CELSIUS_OFFSET_K) * 10;
}

/**
 * Liquid water at (p, t) from IF97 region 1. The water must be liquid: t at
 * or below the saturation temperature at p, i.e. p ≥ p_s(t).
 */
export function liquidWater(
  pressureBarAbs: number,
  temperatureC: number,
  fields: FieldNames = {},
): WaterProperties {
  const tField = fields.temperature ?? "temperatureC";
  const psBar = meterSaturationBar(pressureBarAbs, temperatureC, fields);
  if (pressureBarAbs < psBar * (1 - SATURATION_RELATIVE_TOLERANCE)) {
    throw new PhysicsRangeError(
      `${temperatureC} °C is not liquid at ${pressureBarAbs} bar a: liquid ` +
        `water at ${temperatureC} °C needs at least its saturation pressure ` +
        `${round(psBar, 5)} bar a (IF97 region 1)`,
      tField,
    );
  }
  // The meter range lies inside region 1's (0-250 °C ⊂ 273.15-623.15 K,
  // 40 bar a < 100 MPa) and the phase test above is region 1's own, so the
  // state is known to be in region 1 without a second saturation pressure.
  return region1PropertiesInRange(
    mpa(pressureBarAbs),
    temperatureC + CELSIUS_OFFSET_K,
  );
}

/**
 * Two liquid states at one pressure (a heat meter's flow and return), with
 * exactly the checks and errors of liquidWater for the first state, then
 * the second. The figures go into `out` (first, second).
 *
 * The common case is checked at once: every input inside the meter range,
 * and p at or above the saturation pressure of the hotter state. p_s rises
 * with t (IF97 Eq. 30), so that one saturation pressure clears both states
 * with the whole 1e-9 allowance to spare. Anything else, a bad number
 * included, goes through liquidWater state by state, so that the error
 * names the same field and range as it always did.
 */
export function liquidWaterPair(
  pressureBarAbs: number,
  firstC: number,
  secondC: number,
  fields: { pressure?: string; first: string; second: string },
  out: LiquidPair,
): void {
  const { minTemperatureC: tMin, maxTemperatureC: tMax } = METER_RANGE;
  const { minPressureBarAbs: pMin, maxPressureBarAbs: pMax } = METER_RANGE;
  // Written so that NaN fails every comparison and takes the careful path.
  const inRange =
    pressureBarAbs >= pMin &&
    pressureBarAbs <= pMax &&
    firstC >= tMin &&
    firstC <= tMax &&
    secondC >= tMin &&
    secondC <= tMax;
  // 0-250 °C lies on the saturation line, so p_s needs no guard of its own.
  const hotterK = Math.max(firstC, secondC) + CELSIUS_OFFSET_K;
  if (!inRange || pressureBarAbs < saturationPressureInRangeMpa(hotterK) * 10) {
    const p = fields.pressure;
    liquidWater(pressureBarAbs, firstC, {
      pressure: p,
      temperature: fields.first,
    });
    liquidWater(pressureBarAbs, secondC, {
      pressure: p,
      temperature: fields.second,
    });
  }
  region1LiquidPairInRange(
    mpa(pressureBarAbs),
    firstC + CELSIUS_OFFSET_K,
    secondC + CELSIUS_OFFSET_K,
    out,
  );
}

/**
 * Steam at (p, t) from IF97 region 2: saturated or superheated vapour, t at
 * or above the saturation temperature at p, i.e. p ≤ p_s(t).
 */
export function steam(
  pressureBarAbs: number,
  temperatureC: number,
  fields: FieldNames = {},
): WaterProperties {
  const tField = fields.temperature ?? "temperatureC";
  const psBar = meterSaturationBar(pressureBarAbs, temperatureC, fields);
  if (pressureBarAbs > psBar * (1 + SATURATION_RELATIVE_TOLERANCE)) {
    throw new PhysicsRangeError(
      `${temperatureC} °C is below saturation at ${pressureBarAbs} bar a: ` +
        `steam at ${temperatureC} °C exists only up to its saturation ` +
        `pressure ${round(psBar, 5)} bar a (IF97 region 2)`,
      tField,
    );
  }
  return region2Properties(
    mpa(pressureBarAbs),
    temperatureC + CELSIUS_OFFSET_K,
  );
}

function requireSaturationPressureBar(field: string, pBarAbs: number): void {
  requireMeterPressureBar(field, pBarAbs);
  if (pBarAbs < SATURATION_MIN_PRESSURE_BAR) {
    throw new PhysicsRangeError(
      `${pBarAbs} bar a is below the saturation line, which starts at ` +
        `${round(SATURATION_MIN_PRESSURE_BAR, 8)} bar a (0 °C); saturation ` +
        `states need ${round(SATURATION_MIN_PRESSURE_BAR, 8)} bar a to ` +
        `${METER_RANGE.maxPressureBarAbs} bar a`,
      field,
    );
  }
}

/** Saturation temperature T_s(p) in °C, IF97 Eq. 31, p within meter range. */
export function saturationTemperatureC(
  pressureBarAbs: number,
  field = "pressureBarAbs",
): number {
  requireSaturationPressureBar(field, pressureBarAbs);
  return saturationTemperatureK(mpa(pressureBarAbs)) - CELSIUS_OFFSET_K;
}

/**
 * Saturation pressure p_s(t) in bar a, IF97 Eq. 30, for t on the saturation
 * line within the meter's pressure range (SATURATION_RANGE).
 */
export function saturationPressureBarAbs(
  temperatureC: number,
  field = "temperatureC",
): number {
  requireFinite(field, temperatureC);
  const { minTemperatureC: min, maxTemperatureC: max } = SATURATION_RANGE;
  const pBar =
    temperatureC >= min
      ? saturationPressureMpa(temperatureC + CELSIUS_OFFSET_K) * 10
      : NaN;
  // Compared as pressures, with the rounding allowance, so that T_s(40 bar a)
  // computed to the last digit is accepted like 40 bar a itself.
  const tooHigh =
    pBar > METER_RANGE.maxPressureBarAbs * (1 + SATURATION_RELATIVE_TOLERANCE);
  if (temperatureC < min || tooHigh) {
    throw new PhysicsRangeError(
      `${temperatureC} °C is outside the saturation range ` +
        `${min} °C to ${round(max, 2)} °C, the saturation temperatures of ` +
        `${round(SATURATION_RANGE.minPressureBarAbs, 8)} bar a to ` +
        `${SATURATION_RANGE.maxPressureBarAbs} bar a`,
      field,
    );
  }
  return Math.min(pBar, METER_RANGE.maxPressureBarAbs);
}

/**
 * Liquid at or below the saturation temperature at p, e.g. condensate: from
 * 0 °C up to T_s(p), so its range follows the steam's (up to 250.36 °C at
 * 40 bar a) rather than the 0-250 °C of water sensors. IF97 region 1 holds
 * up to 350 °C.
 */
export function liquidUpToSaturation(
  pressureBarAbs: number,
  temperatureC: number,
  fields: FieldNames = {},
): WaterProperties {
  const pField = fields.pressure ?? "pressureBarAbs";
  const tField = fields.temperature ?? "temperatureC";
  requireFinite(tField, temperatureC);
  const tsC = saturationTemperatureC(pressureBarAbs, pField);
  if (temperatureC < METER_RANGE.minTemperatureC || temperatureC > tsC) {
    throw new PhysicsRangeError(
      `${temperatureC} °C is outside ${METER_RANGE.minTemperatureC} °C to ` +
        `${round(tsC, 2)} °C, liquid water at ${pressureBarAbs} bar a ` +
        `(IF97 region 1)`,
      tField,
    );
  }
  return region1Properties(
    mpa(pressureBarAbs),
    temperatureC + CELSIUS_OFFSET_K,
  );
}

export interface SaturationState {
  pressureBarAbs: number;
  temperatureC: number;
  /** h′ = h_f, saturated liquid (IF97 region 1 at T_s(p)). */
  liquidEnthalpyKjPerKg: number;
  /** h″ = h_g, saturated vapour (IF97 region 2 at T_s(p)). */
  vapourEnthalpyKjPerKg: number;
  /** h_fg = h″ − h′, the latent heat of vaporization. */
  latentHeatKjPerKg: number;
  liquidDensityKgPerM3: number;
  vapourDensityKgPerM3: number;
}

/** Both saturated phases at a pressure (IF97 regions 1 and 2 at T_s(p)). */
export function saturationAtPressure(
  pressureBarAbs: number,
  field = "pressureBarAbs",
): SaturationState {
  const tsC = saturationTemperatureC(pressureBarAbs, field);
  const tsK = tsC + CELSIUS_OFFSET_K;
  const liquid = region1Properties(mpa(pressureBarAbs), tsK);
  const vapour = region2Properties(mpa(pressureBarAbs), tsK);
  return {
    pressureBarAbs,
    temperatureC: tsC,
    liquidEnthalpyKjPerKg: liquid.enthalpyKjPerKg,
    vapourEnthalpyKjPerKg: vapour.enthalpyKjPerKg,
    latentHeatKjPerKg: vapour.enthalpyKjPerKg - liquid.enthalpyKjPerKg,
    liquidDensityKgPerM3: liquid.densityKgPerM3,
    vapourDensityKgPerM3: vapour.densityKgPerM3,
  };
}

/** h_f, saturated liquid enthalpy at p, kJ/kg. */
export function saturatedLiquidEnthalpyKjPerKg(pressureBarAbs: number): number {
  return saturationAtPressure(pressureBarAbs).liquidEnthalpyKjPerKg;
}

/** h_g, saturated vapour enthalpy at p, kJ/kg. */
export function saturatedVapourEnthalpyKjPerKg(pressureBarAbs: number): number {
  return saturationAtPressure(pressureBarAbs).vapourEnthalpyKjPerKg;
}

/** h_fg = h_g − h_f at p, kJ/kg. */
export function latentHeatKjPerKg(pressureBarAbs: number): number {
  return saturationAtPressure(pressureBarAbs).latentHeatKjPerKg;
}
