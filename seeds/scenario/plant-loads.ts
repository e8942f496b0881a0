// The demo's plant, hour by hour: a gas boiler house at the depot, a heat
// pump at the sheltered housing and a hydrogen fuel-cell CHP at the pool
// (larchmere-estate.ts, PLANTS). Each has its own random stream, so adding
// them left every other meter's readings as they were. Efficiencies are
// invented but plausible (common practice: a gas boiler 80–90 % gross, an
// air-source heat pump about 45 % of its Carnot COP, a PEM fuel cell about
// 45 % electrical on the gross basis).

import type { HourContext } from "./clock";
import { clamp, energy, heatOf, heatingWater, round } from "./encode";
import type { HourValue, WaterHour } from "./encode";
import { demoCalorificValue, schoolBoilerHouse } from "./gas-supplies";
import { BOILER_FAULT, SITE, siteByName } from "./larchmere-estate";
import { noiseFactor, streamFor } from "./prng";
import { heatingDegreeDays } from "./weather";

export type PlantModel = (c: HourContext) => Record<string, HourValue>;

/** 1.02264: the fixed correction factor of small supplies in Great Britain [memory] (references.md §9). */
const GAS_CORRECTION = 1.02264;

/** kWh of hydrogen's gross (higher) heat per kg: 141.79 MJ/kg (references.md §9). */
const HYDROGEN_KWH_PER_KG = 141.79 / 3.6;

const between = (h: number, from: number, to: number) => h >= from && h < to;

function depotBoilerHouse(): PlantModel {
  const rand = streamFor("plant:depot boiler house");
  const base = siteByName(SITE.depot).degreeDayBaseC;
  return (c) => {
    const working = !c.closedDay && between(c.localHour, 6, 18);
    const d = heatingDegreeDays(c.dailyMeanC, base);
    const heat = (working ? 2.2 * d + 6 : 0.6 * d) * noiseFactor(rand, 0.05);
    const water = heatingWater(rand, heat, 75, 15, 3);
    const delivered = heatOf(water);
    const efficiency = 0.86 * noiseFactor(rand, 0.01);
    // The supply's CV series (gas-supplies.ts): its readings carry no CV,
    // each hour takes its day's from the series entered for the supply.
    const cv = demoCalorificValue(c.localDate.slice(0, 7));
    const gasKwh = delivered / efficiency;
    const faulty = c.localDate.startsWith(BOILER_FAULT.month);
    return {
      "DL-GS1": {
        kind: "gas",
        volumeM3: round((gasKwh * 3.6) / (cv * GAS_CORRECTION), 3),
        cvMjM3: cv,
        correctionFactor: GAS_CORRECTION,
      },
      "DL-HX2": faulty ? overRead(water, BOILER_FAULT.overRead) : water,
    };
  };
}

/** The same water, its volume read too high by `factor`. */
function overRead(w: WaterHour, factor: number): WaterHour {
  return { ...w, volumeM3: round(w.volumeM3 * factor, 3) };
}

function housingHeatPump(): PlantModel {
  const rand = streamFor("plant:housing heat pump");
  const base = siteByName(SITE.housing).degreeDayBaseC;
  return (c) => {
    const d = heatingDegreeDays(c.dailyMeanC, base);
    const heat = (3 + 0.9 * d) * noiseFactor(rand, 0.06);
    // Water at 45/40 °C, the outdoor air as the source: about 45 % of the
    // Carnot COP, held within what such machines achieve.
    const sinkK = 42.5 + 273.15;
    const carnot = sinkK / Math.max(sinkK - (c.tempC + 273.15), 5);
    const cop = clamp(0.45 * carnot, 2, 4.5);
    return {
      "BH-HPH": heatingWater(rand, heat, 45, 5, 3),
      "BH-HPE": energy(heat / cop),
    };
  };
}

function poolFuelCell(): PlantModel {
  const rand = streamFor("plant:pool fuel cell");
  return (c) => {
    const running = between(c.localHour, 6, 22);
    const electricity = running ? 25 * noiseFactor(rand, 0.03) : 0;
    const fuelKwh = electricity / (0.45 * noiseFactor(rand, 0.01));
    return {
      "LP-H21": {
        kind: "hydrogen",
        massKg: round(fuelKwh / HYDROGEN_KWH_PER_KG, 4),
      },
      "LP-FCE": energy(electricity),
      "LP-FCH": heatingWater(rand, 0.38 * fuelKwh, 60, 20, 4),
    };
  };
}

export const PLANT_MODELS: readonly (() => PlantModel)[] = [
  depotBoilerHouse,
  housingHeatPump,
  poolFuelCell,
  schoolBoilerHouse,
];
