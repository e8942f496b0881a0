// Load models of the seven sites: what each building draws in an hour. Heat
// follows the day's heating degree days (so a baseline regression on degree
// days fits well), shaped over the day by occupancy in local time; cooling
// follows the air temperature; electricity follows opening hours; solar
// follows the sun. All figures are invented but of a plausible size for the
// building types (a few hundred MWh of heat a year for a town hall).

import type { HourContext } from "./clock";
import {
  chilledWater,
  clamp,
  energy,
  heatingWater,
  round,
  steam,
} from "./encode";
import type { HourValue, WaterHour } from "./encode";
import { SITE, siteByName } from "./larchmere-estate";
import { gaussian, noiseFactor, streamFor } from "./prng";
import type { Random } from "./prng";
import { heatingDegreeDays } from "./weather";

export type HourModel = (c: HourContext) => Record<string, HourValue>;

export interface SiteModel {
  site: string;
  /** A fresh model with its own random stream, at the scenario's start. */
  create(): HourModel;
}

function hdd(site: string, c: HourContext): number {
  return heatingDegreeDays(c.dailyMeanC, siteByName(site).degreeDayBaseC);
}

/**
 * The share of a day's heat that falls in this hour, × 24: `ratio` times as
 * much in each of the `occupied` hours as in the others, summing to 24 over
 * the day (so daily heat stays proportional to degree days).
 */
function dayShape(isOccupied: boolean, occupiedHours: number, ratio: number) {
  const lo = 24 / (occupiedHours * ratio + 24 - occupiedHours);
  return isOccupied ? ratio * lo : lo;
}

function between(hour: number, from: number, to: number): boolean {
  return hour >= from && hour < to;
}

// Weather-compensated flow temperature of a boiler circuit (common practice:
// hotter flow on colder days).
function compensatedFlowC(c: HourContext, at12C: number, slope: number) {
  return clamp(at12C + slope * (12 - c.dailyMeanC), at12C - 5, at12C + 20);
}

const civicHall: SiteModel = {
  site: SITE.civicHall,
  create() {
    const rand = streamFor(SITE.civicHall);
    return (c) => {
      const open = !c.closedDay;
      const occupied = open
        ? between(c.localHour, 6, 19)
        : between(c.localHour, 9, 15);
      const shape = open ? dayShape(occupied, 13, 4) : dayShape(occupied, 6, 2);
      const dailyHeat = 230 * hdd(SITE.civicHall, c) * (open ? 1 : 0.5);
      const heat = (dailyHeat * shape) / 24 + 5;
      const q = heat * noiseFactor(rand, 0.05);
      const flow = clamp(78 + 0.8 * (10 - c.dailyMeanC), 74, 90);
      const elKw = civicElectricKw(c, open);
      return {
        "CH-HX1": heatingWater(
          rand,
          q,
          flow,
          22 + 10 * Math.min(q / 120, 1),
          8,
        ),
        "CH-EL1": energy(elKw * noiseFactor(rand, 0.05)),
      };
    };
  },
};

function civicElectricKw(c: HourContext, open: boolean): number {
  if (!open) return 16;
  const h = c.localHour;
  if (between(h, 7, 19)) return 52 + 0.8 * Math.max(c.tempC - 20, 0);
  if (h === 6 || h === 19) return 30;
  return 14;
}

const school: SiteModel = {
  site: SITE.school,
  create() {
    const rand = streamFor(SITE.school);
    return (c) => {
      const term = !c.schoolHoliday;
      const schoolDay = term && !c.closedDay;
      const occupied = schoolDay && between(c.localHour, 6, 16);
      const shape = schoolDay ? dayShape(occupied, 10, 5) : 1;
      const dayFactor = schoolDay ? 1 : term ? 0.3 : 0.25;
      const dhw = schoolDay && between(c.localHour, 8, 15) ? 1.5 : 0;
      const heat = (150 * hdd(SITE.school, c) * dayFactor * shape) / 24 + dhw;
      const q = heat * noiseFactor(rand, 0.06);
      const flow = compensatedFlowC(c, 62, 1.5);
      let elKw = 5;
      if (schoolDay && between(c.localHour, 7, 17)) elKw = 30;
      else if (!c.closedDay && between(c.localHour, 8, 16)) elKw = 9;
      const el = energy(elKw * noiseFactor(rand, 0.05));
      // One supply, two meters in turn: generate.ts hands the energy to
      // whichever of them is installed in the hour.
      return {
        "NP-HX1": heatingWater(rand, q, flow, 12 + 10 * Math.min(q / 80, 1), 3),
        "NP-EL1": el,
        "NP-EL2": el,
      };
    };
  },
};

/**
 * Sine of the sun's elevation at Larchmere (an invented town at 52.6° N,
 * 1.2° W), from the usual textbook approximation: declination
 * 23.44°·sin(360°·(284 + n)/365) and the hour angle from solar time
 * (longitude correction only; the equation of time, at most about 16 min,
 * is left out).
 */
export function sunSine(dayOfYear: number, utcHour: number): number {
  const rad = Math.PI / 180;
  const lat = 52.6 * rad;
  const decl = 23.44 * rad * Math.sin((2 * Math.PI * (284 + dayOfYear)) / 365);
  const solarHour = utcHour - 1.2 / 15;
  const hourAngle = (solarHour - 12) * 15 * rad;
  return (
    Math.sin(lat) * Math.sin(decl) +
    Math.cos(lat) * Math.cos(decl) * Math.cos(hourAngle)
  );
}

// A day's clearness, 0.2 (overcast) to 1 (clear), drawn once per day: a
// summer day is more often clear than a winter one.
function clearness(rand: Random, dayOfYear: number): number {
  const summer =
    0.5 - 0.5 * Math.cos((2 * Math.PI * (dayOfYear - 15)) / 365.25);
  const u = rand();
  return clamp(0.2 + 0.8 * u ** (1.3 - 0.6 * summer), 0.2, 1);
}

const PV_KWP = 250;
// Performance ratio of a rooftop array: losses in inverters, wiring, heat
// and dirt (common practice, 0.75–0.85).
const PV_PERFORMANCE_RATIO = 0.8;

const pool: SiteModel = {
  site: SITE.pool,
  create() {
    const rand = streamFor(SITE.pool);
    const sky = streamFor(`${SITE.pool}:sky`);
    let day = "";
    let clear = 1;
    return (c) => {
      if (c.localDate !== day) {
        day = c.localDate;
        clear = clearness(sky, c.dayOfYear);
      }
      const open =
        between(c.localHour, 6, 22) && c.localDate.slice(5) !== "12-25";
      const shape = dayShape(open, 16, 1.5);
      const heat =
        (180 * hdd(SITE.pool, c) * shape) / 24 + 85 + (open ? 15 : 0);
      const q = heat * noiseFactor(rand, 0.04);
      // The power goes a little more than linearly with the sine of the
      // elevation: a low sun also crosses more air.
      const sun = Math.max(sunSine(c.dayOfYear, c.utcMidHour), 0);
      const pvKw =
        PV_KWP *
        PV_PERFORMANCE_RATIO *
        sun ** 1.15 *
        clear *
        noiseFactor(rand, 0.1);
      const loadKw =
        (40 + (open ? 18 : 0) + 0.5 * Math.max(c.tempC - 18, 0)) *
        noiseFactor(rand, 0.04);
      return {
        "LP-HX1": heatingWater(
          rand,
          q,
          75 + 0.5 * gaussian(rand),
          15 + 5 * Math.min(q / 250, 1),
          4,
        ),
        "LP-EL1": energy(loadKw - pvKw),
        "LP-PV1": energy(pvKw - loadKw),
      };
    };
  },
};

const depot: SiteModel = {
  site: SITE.depot,
  create() {
    const rand = streamFor(SITE.depot);
    return (c) => {
      const saturday = c.weekday === 6 && !c.publicHoliday;
      const working = !c.closedDay && between(c.localHour, 6, 18);
      const morning = saturday && between(c.localHour, 7, 12);
      const d = hdd(SITE.depot, c);
      let massKg = 6 * noiseFactor(rand, 0.3) + 3 * d;
      if (working) massKg = 290 * noiseFactor(rand, 0.1) + 11 * d;
      else if (morning) massKg = 150 * noiseFactor(rand, 0.1) + 6 * d;
      const busy = working || morning;
      const pressureG = (busy ? 7.0 : 7.2) + 0.12 * gaussian(rand);
      const condensate = busy
        ? 90 + 2.5 * gaussian(rand)
        : 70 + 4 * gaussian(rand);
      let elKw = 9;
      if (working) elKw = 46;
      else if (morning) elKw = 24;
      return {
        "DL-ST1": steam(
          massKg,
          clamp(pressureG, 6.4, 7.6),
          clamp(condensate, 60, 95),
        ),
        "DL-EL1": energy(elKw * noiseFactor(rand, 0.05)),
      };
    };
  },
};

// The archive room's chiller runs on the library supply with a coefficient
// of performance of about 3 (common practice for a small air-cooled chiller).
const CHILLER_COP = 3;

const library: SiteModel = {
  site: SITE.library,
  create() {
    const rand = streamFor(SITE.library);
    return (c) => {
      // Open Monday to Saturday, shut on Sundays and bank holidays.
      const openDay = c.weekday !== 7 && !c.publicHoliday;
      const occupied = openDay && between(c.localHour, 8, 18);
      const shape = openDay ? dayShape(occupied, 10, 3) : 1;
      const heat =
        (65 * hdd(SITE.library, c) * (openDay ? 1 : 0.5) * shape) / 24 + 0.8;
      const q = heat * noiseFactor(rand, 0.06);
      const coolKw =
        (3.5 + 0.45 * Math.max(c.tempC - 10, 0)) * noiseFactor(rand, 0.08);
      const lightsKw = openDay && between(c.localHour, 9, 18) ? 12 : 3;
      const elKw = lightsKw * noiseFactor(rand, 0.05) + coolKw / CHILLER_COP;
      return {
        "RL-HX1": heatingWater(
          rand,
          q,
          compensatedFlowC(c, 60, 1.5),
          12 + 10 * Math.min(q / 40, 1),
          3,
        ),
        "RL-CW1": chilledWater(
          rand,
          coolKw,
          6.5 + 0.2 * gaussian(rand),
          4 + 2 * Math.min(coolKw / 10, 1),
          3,
        ),
        "RL-EL1": energy(elKw),
      };
    };
  },
};

// Three blocks of flats under one energy centre. Each block's heat goes
// through its own sub-meter; the main meter sees all of it plus the loss of
// the buried distribution pipes (the flow cools on the way to each block,
// and the return on the way back).
const BLOCKS = [
  { code: "BH-HXA", ua: 75, dhw: 3.5, flowDropK: 0.8 },
  { code: "BH-HXB", ua: 62, dhw: 3.0, flowDropK: 1.0 },
  { code: "BH-HXC", ua: 88, dhw: 4.2, flowDropK: 1.3 },
] as const;
const RETURN_DROP_K = 0.3;

// Domestic hot water over the day: morning and evening peaks, little at
// night; the shape averages close to 1.
function hotWaterShape(hour: number): number {
  if (hour < 6) return 0.4;
  if (hour === 6) return 1;
  if (hour < 9) return 2.4;
  if (hour < 17) return 0.9;
  if (hour < 21) return 1.7;
  return 0.8;
}

const housing: SiteModel = {
  site: SITE.housing,
  create() {
    const rand = streamFor(SITE.housing);
    return (c) => {
      const d = hdd(SITE.housing, c);
      const awake = between(c.localHour, 6, 23);
      const shape = dayShape(awake, 17, 1.3);
      const mainFlow = compensatedFlowC(c, 65, 1.2);
      const out: Record<string, HourValue> = {};
      const blocks: WaterHour[] = [];
      for (const b of BLOCKS) {
        const heat =
          (b.ua * d * shape) / 24 + b.dhw * hotWaterShape(c.localHour);
        const q = heat * noiseFactor(rand, 0.06);
        const w = heatingWater(
          rand,
          q,
          mainFlow - b.flowDropK,
          15 + 8 * Math.min(q / 60, 1),
          5,
        );
        out[b.code] = w;
        blocks.push(w);
      }
      out["BH-HX0"] = mainMeter(rand, mainFlow, blocks);
      return out;
    };
  },
};

// The main meter sees the blocks' water together: their volumes add up, and
// its return is their mixed return, a little cooler after the way back.
function mainMeter(rand: Random, flowC: number, blocks: WaterHour[]) {
  let volume = 0;
  let returnMix = 0;
  for (const w of blocks) {
    volume += w.volumeM3;
    returnMix += w.volumeM3 * w.returnC;
  }
  const main: WaterHour = {
    kind: "water",
    volumeM3: round(volume, 3),
    flowC: round(flowC, 1),
    returnC: volume > 0 ? round(returnMix / volume - RETURN_DROP_K, 1) : 21,
    pressureBarAbs: round(5 + 0.03 * gaussian(rand), 2),
  };
  return main;
}

const dataRoom: SiteModel = {
  site: SITE.dataRoom,
  create() {
    const rand = streamFor(SITE.dataRoom);
    return (c) => {
      // IT load grows about 6 % a year as racks fill (invented).
      const itKw = 36 * (1 + 0.06 * c.years) * noiseFactor(rand, 0.02);
      const coolKw =
        (itKw + 0.35 * Math.max(c.tempC - 5, 0)) * noiseFactor(rand, 0.03);
      const elKw = itKw + 3 + coolKw / 3.5;
      return {
        "DR-CW1": chilledWater(
          rand,
          coolKw,
          7 + 0.15 * gaussian(rand),
          5 + Math.min(coolKw / 45, 1),
          4,
        ),
        "DR-EL1": energy(elKw),
      };
    };
  },
};

export const SITE_MODELS: readonly SiteModel[] = [
  civicHall,
  school,
  pool,
  depot,
  library,
  housing,
  dataRoom,
];
