// Heat carried by a water circuit past a heat meter:
//   Q = V · ρ(t_sensor, p) · (h(t_flow, p) − h(t_return, p))
// V is the volume the flow sensor registers at line conditions, so the
// density belongs to the pipe the sensor sits in; h comes from IAPWS-IF97
// region 1. Positive Q is heat delivered to the load downstream of the meter;
// chilled water (flow colder than return) comes out negative by itself.

import { requireNonNegative } from "./errors";
import { liquidPairRecord } from "./if97";
import { liquidWaterPair } from "./water-properties";

export type SensorPosition = "flow" | "return";

export interface WaterHeatInput {
  volumeM3: number;
  flowTempC: number;
  returnTempC: number;
  pressureBarAbs: number;
  sensorAt: SensorPosition;
}

export interface WaterHeatResult {
  energyKj: number;
  massKg: number;
  densityAtSensorKgPerM3: number;
  flowEnthalpyKjPerKg: number;
  returnEnthalpyKjPerKg: number;
  /** IF97 region 1 entropies, for the exergy (water-exergy.ts). */
  flowEntropyKjPerKgK: number;
  returnEntropyKjPerKgK: number;
  /** EN 1434 heat coefficient k; null when flow and return are equal. */
  kFactorKwhPerM3K: number | null;
}

const KJ_PER_KWH = 3600;

// Scratch for the two states: JavaScript runs one call at a time per thread,
// and waterHeat copies what it needs out before it returns.
const STATES = liquidPairRecord();

// The inputs' names, for an error about either temperature.
const FIELDS = { first: "flowTempC", second: "returnTempC" } as const;

export function waterHeat(input: WaterHeatInput): WaterHeatResult {
  // The check's own function only when it will throw (NaN fails both tests).
  const v = input.volumeM3;
  if (!(v >= 0 && v < Infinity)) requireNonNegative("volumeM3", v);
  liquidWaterPair(
    input.pressureBarAbs,
    input.flowTempC,
    input.returnTempC,
    FIELDS,
    STATES,
  );
  const hFlow = STATES.firstEnthalpyKjPerKg;
  const hReturn = STATES.secondEnthalpyKjPerKg;
  const rho =
    input.sensorAt === "flow"
      ? STATES.firstDensityKgPerM3
      : STATES.secondDensityKgPerM3;
  const dh = hFlow - hReturn;
  const massKg = input.volumeM3 * rho;
  return {
    energyKj: massKg * dh,
    massKg,
    densityAtSensorKgPerM3: rho,
    flowEnthalpyKjPerKg: hFlow,
    returnEnthalpyKjPerKg: hReturn,
    flowEntropyKjPerKgK: STATES.firstEntropyKjPerKgK,
    returnEntropyKjPerKgK: STATES.secondEntropyKjPerKgK,
    kFactorKwhPerM3K: kFactor(rho, dh, input.flowTempC - input.returnTempC),
  };
}

// k = ρ · (h_f − h_r) / (Θ_f − Θ_r), the heat coefficient of EN 1434-1 /
// OIML R 75 (references.md §3), here in kWh/(m³·K). Undefined at ΔΘ = 0.
function kFactor(rho: number, dhKjPerKg: number, dThetaK: number) {
  if (dThetaK === 0) return null;
  return (rho * dhKjPerKg) / dThetaK / KJ_PER_KWH;
}

/** The heat coefficient alone, for a meter with the sensor at `sensorAt`. */
export function heatCoefficientKwhPerM3K(
  flowTempC: number,
  returnTempC: number,
  pressureBarAbs: number,
  sensorAt: SensorPosition,
): number | null {
  const r = waterHeat({
    volumeM3: 1,
    flowTempC,
    returnTempC,
    pressureBarAbs,
    sensorAt,
  });
  return r.kFactorKwhPerM3K;
}
