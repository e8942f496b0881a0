// From a load (kWh in the hour) to what a heat or steam meter registers:
// volume and temperatures, or condensate mass, pressure and temperature.
// The numbers are shaped to give back roughly the intended energy through
// the real physics; the ledger recomputes the energy from them anyway.

import type { Random } from "./prng";
import { gaussian } from "./prng";

export interface WaterHour {
  kind: "water";
  volumeM3: number;
  flowC: number;
  returnC: number;
  pressureBarAbs: number;
}

export interface SteamHour {
  kind: "steam";
  massKg: number;
  pressureBarG: number;
  condensateC: number;
}

/** Energy for a register meter to count. */
export interface EnergyHour {
  kind: "energy";
  kwh: number;
}

/** Natural gas through a meter in the hour, with the supply's CV and correction. */
export interface GasHour {
  kind: "gas";
  volumeM3: number;
  cvMjM3: number;
  correctionFactor: number;
}

/** Hydrogen used in the hour. */
export interface HydrogenHour {
  kind: "hydrogen";
  massKg: number;
}

export type HourValue =
  WaterHour | SteamHour | EnergyHour | GasHour | HydrogenHour;

// ρ·c_p/3600 for water near 50 °C and near 8 °C, kWh/(m³·K): 988 kg/m³ ×
// 4.18 kJ/(kg·K) and 1000 kg/m³ × 4.19 kJ/(kg·K) (common practice; rounded
// table values). Only used to size the volume; the physics does the rest.
const K_HOT = 1.147;
const K_COLD = 1.164;

export function round(x: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(x * f) / f;
}

export function clamp(x: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, x));
}

// A static pressure as a gauge shows it: the set value ± a little.
function pressure(rand: Random, barAbs: number): number {
  return round(barAbs + 0.03 * gaussian(rand), 2);
}

/**
 * Heating water: `kwh` delivered at `flowC` with a temperature drop of
 * `deltaK`. With no load the pump stands still: no volume, and the pipes sit
 * near room temperature.
 */
export function heatingWater(
  rand: Random,
  kwh: number,
  flowC: number,
  deltaK: number,
  pressureBarAbs: number,
): WaterHour {
  const p = pressure(rand, pressureBarAbs);
  if (kwh < 0.05) {
    const room = round(21 + 0.5 * gaussian(rand), 1);
    return {
      kind: "water",
      volumeM3: 0,
      flowC: room,
      returnC: round(room - 0.4, 1),
      pressureBarAbs: p,
    };
  }
  const flow = round(flowC, 1);
  const ret = round(flowC - deltaK, 1);
  const volume = round(kwh / (K_HOT * (flow - ret)), 3);
  return {
    kind: "water",
    volumeM3: volume,
    flowC: flow,
    returnC: ret,
    pressureBarAbs: p,
  };
}

/** Chilled water: `kwh` of cooling, the return warmer than the flow by deltaK. */
export function chilledWater(
  rand: Random,
  kwh: number,
  flowC: number,
  deltaK: number,
  pressureBarAbs: number,
): WaterHour {
  const flow = round(flowC, 1);
  const ret = round(flowC + deltaK, 1);
  const volume = round(kwh / (K_COLD * (ret - flow)), 3);
  return {
    kind: "water",
    volumeM3: volume,
    flowC: flow,
    returnC: ret,
    pressureBarAbs: pressure(rand, pressureBarAbs),
  };
}

export function steam(
  massKg: number,
  pressureBarG: number,
  condensateC: number,
): SteamHour {
  return {
    kind: "steam",
    massKg: round(Math.max(massKg, 0), 1),
    pressureBarG: round(pressureBarG, 2),
    condensateC: round(condensateC, 1),
  };
}

/** The heat a water reading was sized for: the inverse of heatingWater. */
export function heatOf(w: WaterHour): number {
  return w.volumeM3 * K_HOT * (w.flowC - w.returnC);
}

export function energy(kwh: number): EnergyHour {
  return { kind: "energy", kwh: Math.max(kwh, 0) };
}
