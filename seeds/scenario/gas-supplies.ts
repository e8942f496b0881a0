// The demo's gas supplies (issue #15), all invented: a monthly calorific
// value series for every gas supply of the estate, and a second boiler
// house, at Northgate Primary School, whose old imperial gas meter reads a
// register in hundreds of cubic feet (×10 dial) and whose boiler heat meter
// sits inside the boundary. Its gas readings carry no CV: each hour takes
// its day's CV from the series, as a real supply's would.
//
// Plain data and models; the seed writes the series and the settings
// (seeds/seed-gas-supplies.ts). This module imports no value from
// larchmere-estate.ts, which lists these meters and this plant, so the two
// do not load each other.

import { CUBIC_METRES_PER_HCF } from "../../app/gas/calorific-values";
import type { HourContext } from "./clock";
import { heatOf, heatingWater, round } from "./encode";
import type { HourValue } from "./encode";
import type { ScenarioMeter, ScenarioPlant } from "./larchmere-estate";
import { noiseFactor, streamFor } from "./prng";
import { heatingDegreeDays } from "./weather";

/** SITE.school in larchmere-estate.ts (not imported: see above). */
const SCHOOL = "Northgate Primary School";
const SCHOOL_DEGREE_DAY_BASE_C = 15.5;
const INSTALLED = "2019-06-01T00:00:00Z";

export const SCHOOL_GAS_REGISTER = "NP-GR1";
export const SCHOOL_BOILER_HEAT = "NP-HX2";

export const SCHOOL_GAS_METERS: readonly ScenarioMeter[] = [
  {
    code: SCHOOL_GAS_REGISTER,
    name: "Gas meter, school boiler house (hcf register, ×10)",
    siteName: SCHOOL,
    quantity: "gas_volume",
    carrier: "natural_gas",
    orientation: "import",
    serial: "GM-98-20456",
    // Each register step is 10 hcf of gas; the register's four dials roll
    // over after 9999.
    multiplier: 10,
    rolloverKwh: 10_000,
    installedAt: INSTALLED,
  },
  {
    code: SCHOOL_BOILER_HEAT,
    name: "School boiler house heat meter",
    siteName: SCHOOL,
    quantity: "water_heat",
    carrier: "heat",
    orientation: "import",
    position: "internal",
    serial: "HM-19-20457",
    multiplier: 1,
    sensorAt: "return",
    defaultPressureBarAbs: 3,
    installedAt: INSTALLED,
  },
];

export const SCHOOL_BOILER_PLANT: ScenarioPlant = {
  siteName: SCHOOL,
  name: "School boiler house",
  kind: "boiler",
  meters: { fuel_in: SCHOOL_GAS_REGISTER, heat_out: SCHOOL_BOILER_HEAT },
  heatFlowC: 70,
  heatReturnC: 55,
};

/**
 * Gas registers of the scenario: their unit, their value when the scenario
 * starts (in that unit) and their display resolution, and the meter's
 * volume correction (gas at about 12 °C and 21 mbar above atmospheric, a
 * low-pressure supply; invented).
 */
export const GAS_REGISTERS: Record<
  string,
  {
    unit: "hcf";
    start: number;
    decimals: number;
    gasTempC: number;
    gasPressureMbarG: number;
  }
> = {
  [SCHOOL_GAS_REGISTER]: {
    unit: "hcf",
    // Near the end of its dials: it rolls over in the scenario's first year.
    start: 9_862.4,
    decimals: 2,
    gasTempC: 12,
    gasPressureMbarG: 21,
  },
};

export function isGasRegister(code: string): boolean {
  return code in GAS_REGISTERS;
}

/**
 * The supplies' gross CV for a site-local month, MJ/m³ (invented): a
 * little richer gas in winter, a small month-to-month wander, always within
 * 38.5–40.0.
 */
export function demoCalorificValue(month: string): number {
  const [year, m] = month.split("-").map(Number);
  const seasonal = 0.35 * Math.cos((2 * Math.PI * (m - 1)) / 12);
  const wander = 0.15 * Math.sin(year * 12 + m * 2.3);
  return round(Math.min(40, Math.max(38.5, 39.25 + seasonal + wander)), 2);
}

/**
 * The series entered for every gas supply: from the scenario's first month
 * through 2027, so the live demo that continues the scenario finds its
 * month's value.
 */
export function demoCvSeries(): { period: string; cv: number }[] {
  const out: { period: string; cv: number }[] = [];
  for (let year = 2024; year <= 2027; year++) {
    for (let m = 1; m <= 12; m++) {
      const period = `${year}-${String(m).padStart(2, "0")}`;
      if (period < "2024-12") continue;
      out.push({ period, cv: demoCalorificValue(period) });
    }
  }
  return out;
}

/** The ideal-gas correction of the register's gas (gas-volume.ts's formula). */
function registerCorrection(code: string): number {
  const g = GAS_REGISTERS[code];
  return (
    ((1013.25 + g.gasPressureMbarG) / 1013.25) *
    (288.15 / (273.15 + g.gasTempC))
  );
}

const between = (h: number, from: number, to: number) => h >= from && h < to;

/**
 * The school's boiler house: heating in the school day (and a little
 * frost protection at night), a boiler of about 84 % gross. The gas meter's
 * hour is what its register advances by, in hcf: generate.ts counts it
 * like every register (multiplier, resolution, roll-over).
 */
export function schoolBoilerHouse(): (
  c: HourContext,
) => Record<string, HourValue> {
  const rand = streamFor("plant:school boiler house");
  const correction = registerCorrection(SCHOOL_GAS_REGISTER);
  return (c) => {
    const open = !c.closedDay && between(c.localHour, 6, 17);
    const d = heatingDegreeDays(c.dailyMeanC, SCHOOL_DEGREE_DAY_BASE_C);
    const heat = (open ? 1.8 * d + 4 : 0.3 * d) * noiseFactor(rand, 0.05);
    const water = heatingWater(rand, heat, 70, 15, 3);
    const efficiency = 0.84 * noiseFactor(rand, 0.01);
    const gasKwh = heatOf(water) / efficiency;
    const cv = demoCalorificValue(c.localDate.slice(0, 7));
    // kWh → m³ at 15 °C and 1013.25 mbar → m³ at the meter → hcf.
    const meteredM3 = (gasKwh * 3.6) / cv / correction;
    return {
      [SCHOOL_BOILER_HEAT]: water,
      [SCHOOL_GAS_REGISTER]: {
        kind: "energy",
        kwh: meteredM3 / CUBIC_METRES_PER_HCF,
      },
    };
  };
}
