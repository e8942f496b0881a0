// Deterministic generator of the demo scenario's gateway readings, in the
// JSON shape of POST /api/v1/readings (design.md, "Gateway API"): hourly
// water-heat and steam intervals, and hourly register reads at the hour.
// The same range always gives the same readings, on any machine.

import { HOUR_MS, hourContext, isoSeconds } from "./clock";
import type { HourContext } from "./clock";
import type {
  GasHour,
  HourValue,
  HydrogenHour,
  SteamHour,
  WaterHour,
} from "./encode";
import { GAS_REGISTERS, isGasRegister } from "./gas-supplies";
import { METERS, SCENARIO_GAPS, SCENARIO_PERIOD } from "./larchmere-estate";
import type { ScenarioMeter } from "./larchmere-estate";
import { SITE_MODELS } from "./loads";
import { PLANT_MODELS } from "./plant-loads";

export type WaterHeatReading = {
  meter: string;
  start: string;
  end: string;
  quantity: "water_heat";
  volume_m3: number;
  flow_temp_c: number;
  return_temp_c: number;
  pressure_bar_abs: number;
  sensor_at: "flow" | "return";
};

export type SteamHeatReading = {
  meter: string;
  start: string;
  end: string;
  quantity: "steam_heat";
  mass_kg: number;
  pressure_bar_g: number;
  condensate_temp_c: number;
};

export type RegisterReading = {
  meter: string;
  time: string;
  quantity: "electric_register";
  register_kwh: number;
};

/** No CV: each hour takes its day's from the supply's series (gas-supplies.ts). */
export type GasVolumeReading = {
  meter: string;
  start: string;
  end: string;
  quantity: "gas_volume";
  volume_m3: number;
  correction_factor: number;
};

/** A gas register read in hundreds of cubic feet (gas-supplies.ts). */
export type GasRegisterReading = {
  meter: string;
  time: string;
  quantity: "gas_register";
  register_hcf: number;
};

export type HydrogenReading = {
  meter: string;
  start: string;
  end: string;
  quantity: "hydrogen";
  mass_kg: number;
};

export type GatewayReading =
  | WaterHeatReading
  | SteamHeatReading
  | GasVolumeReading
  | HydrogenReading
  | RegisterReading
  | GasRegisterReading;

export interface ScenarioReading {
  meter: string;
  reading: GatewayReading;
}

export interface GenerateRange {
  from: Date;
  to: Date;
}

/**
 * Each register's value at the start of the scenario, and its display
 * resolution. The Civic Hall meter counts behind 40:1 CTs, so it shows
 * hundredths; the replacement school meter starts at 3.2 kWh, the energy of
 * its factory test.
 */
export const REGISTER_START: Record<string, { kwh: number; decimals: number }> =
  {
    "CH-EL1": { kwh: 18_422.37, decimals: 2 },
    "NP-EL1": { kwh: 231_845.6, decimals: 1 },
    "NP-EL2": { kwh: 3.2, decimals: 1 },
    "LP-EL1": { kwh: 604_118.9, decimals: 1 },
    "LP-PV1": { kwh: 88_240.5, decimals: 1 },
    "DL-EL1": { kwh: 377_051.2, decimals: 1 },
    "RL-EL1": { kwh: 52_300.0, decimals: 1 },
    "DR-EL1": { kwh: 141_906.4, decimals: 1 },
    "BH-HPE": { kwh: 12_480.0, decimals: 1 },
    "LP-FCE": { kwh: 0, decimals: 1 },
    // Gas registers count in their own unit (hcf), the same way.
    ...Object.fromEntries(
      Object.entries(GAS_REGISTERS).map(([code, g]) => [
        code,
        { kwh: g.start, decimals: g.decimals },
      ]),
    ),
  };

class Register {
  private advanceKwh = 0;
  private readonly start: { kwh: number; decimals: number };

  constructor(private readonly meter: ScenarioMeter) {
    const start = REGISTER_START[meter.code];
    if (start === undefined) {
      throw new Error(`no starting register value for ${meter.code}`);
    }
    this.start = start;
  }

  add(kwh: number): void {
    this.advanceKwh += kwh;
  }

  // The register counts energy / multiplier; it shows whole steps of its
  // resolution and wraps to zero at the roll-over point. Integer steps keep
  // the wrap exact.
  read(): number {
    const step = 10 ** -this.start.decimals;
    const counted = this.start.kwh + this.advanceKwh / this.meter.multiplier;
    let steps = Math.round(counted / step);
    if (this.meter.rolloverKwh !== undefined) {
      steps %= Math.round(this.meter.rolloverKwh / step);
    }
    return Number((steps * step).toFixed(this.start.decimals));
  }
}

function gapHours(): Map<string, Set<number>> {
  const out = new Map<string, Set<number>>();
  for (const g of SCENARIO_GAPS) {
    const set = out.get(g.meter) ?? new Set<number>();
    const t0 = Date.parse(g.start);
    for (let k = 0; k < g.hours; k++) set.add(t0 + k * HOUR_MS);
    out.set(g.meter, set);
  }
  return out;
}

/** Installed over the whole hour starting at t (interval meters, energy). */
function activeOver(m: ScenarioMeter, t: number): boolean {
  if (Date.parse(m.installedAt) > t) return false;
  return m.removedAt === undefined || t + HOUR_MS <= Date.parse(m.removedAt);
}

/** Installed at the instant t, removal instant included (its last read). */
function activeAt(m: ScenarioMeter, t: number): boolean {
  if (Date.parse(m.installedAt) > t) return false;
  return m.removedAt === undefined || t <= Date.parse(m.removedAt);
}

function waterReading(
  m: ScenarioMeter,
  c: HourContext,
  end: string,
  v: WaterHour,
): WaterHeatReading {
  return {
    meter: m.code,
    start: c.iso,
    end,
    quantity: "water_heat",
    volume_m3: v.volumeM3,
    flow_temp_c: v.flowC,
    return_temp_c: v.returnC,
    pressure_bar_abs: v.pressureBarAbs,
    sensor_at: m.sensorAt ?? "return",
  };
}

function steamReading(
  m: ScenarioMeter,
  c: HourContext,
  end: string,
  v: SteamHour,
): SteamHeatReading {
  return {
    meter: m.code,
    start: c.iso,
    end,
    quantity: "steam_heat",
    mass_kg: v.massKg,
    pressure_bar_g: v.pressureBarG,
    condensate_temp_c: v.condensateC,
  };
}

function gasReading(
  m: ScenarioMeter,
  c: HourContext,
  end: string,
  v: GasHour,
): GasVolumeReading {
  return {
    meter: m.code,
    start: c.iso,
    end,
    quantity: "gas_volume",
    volume_m3: v.volumeM3,
    correction_factor: v.correctionFactor,
  };
}

function hydrogenReading(
  m: ScenarioMeter,
  c: HourContext,
  end: string,
  v: HydrogenHour,
): HydrogenReading {
  return {
    meter: m.code,
    start: c.iso,
    end,
    quantity: "hydrogen",
    mass_kg: v.massKg,
  };
}

/** The reading a meter sends for an hour's value. */
function intervalReading(
  m: ScenarioMeter,
  c: HourContext,
  end: string,
  v: HourValue,
): GatewayReading | undefined {
  switch (v.kind) {
    case "water":
      return waterReading(m, c, end, v);
    case "steam":
      return steamReading(m, c, end, v);
    case "gas":
      return gasReading(m, c, end, v);
    case "hydrogen":
      return hydrogenReading(m, c, end, v);
    default:
      return undefined;
  }
}

function requireRange(range: GenerateRange): void {
  const from = range.from.getTime();
  const to = range.to.getTime();
  if (from % HOUR_MS !== 0 || to % HOUR_MS !== 0) {
    throw new RangeError("from and to must be whole UTC hours");
  }
  if (from < SCENARIO_PERIOD.from.getTime()) {
    throw new RangeError(
      `the scenario starts at ${SCENARIO_PERIOD.from.toISOString()}`,
    );
  }
  if (to <= from) throw new RangeError("to must be after from");
}

const isRegisterMeter = (m: ScenarioMeter) =>
  m.quantity === "electric_register" || isGasRegister(m.code);
const REGISTER_METERS = METERS.filter(isRegisterMeter);
const INTERVAL_METERS = METERS.filter((m) => !isRegisterMeter(m));

function registerReading(
  m: ScenarioMeter,
  time: string,
  value: number,
): GatewayReading {
  return isGasRegister(m.code)
    ? { meter: m.code, time, quantity: "gas_register", register_hcf: value }
    : {
        meter: m.code,
        time,
        quantity: "electric_register",
        register_kwh: value,
      };
}

/**
 * The scenario simulated hour by hour from its start, as far as it is asked
 * to go: the seed runs one over the two years, the live demo keeps one and
 * steps it as each hour ends, so both give the same readings for an hour.
 * The load models and registers carry state from hour to hour, which is why
 * a run can only go forwards.
 */
export class ScenarioRun {
  private readonly models = [
    ...SITE_MODELS.map((s) => s.create()),
    ...PLANT_MODELS.map((create) => create()),
  ];
  private readonly registers = new Map(
    REGISTER_METERS.map((m) => [m.code, new Register(m)]),
  );
  private readonly gaps = gapHours();
  private readonly epoch = SCENARIO_PERIOD.from.getTime();
  /** Start of the next hour to simulate. */
  private nextHour = this.epoch;
  /** The instant of the newest register reads yielded (−∞: none yet). */
  private registersReadAt = -Infinity;

  /** Everything before this instant has been simulated. */
  get position(): Date {
    return new Date(this.nextHour);
  }

  /**
   * Simulates the hours from the run's position up to `to` (a whole UTC
   * hour) and yields the readings from `emitFrom` on: each hour's interval
   * readings, and the register reads at each hour boundary in [emitFrom,
   * to], each boundary once over the life of the run.
   */
  *advance(to: Date, emitFrom: Date): Generator<ScenarioReading> {
    const end = to.getTime();
    const from = emitFrom.getTime();
    if (end % HOUR_MS !== 0 || from % HOUR_MS !== 0) {
      throw new RangeError("to and emitFrom must be whole UTC hours");
    }
    if (end < this.nextHour) {
      throw new RangeError(
        `the run is already at ${this.position.toISOString()}`,
      );
    }
    for (; this.nextHour < end; this.nextHour += HOUR_MS) {
      const c = hourContext(this.nextHour, this.epoch);
      if (c.t >= from) yield* this.registerReads(c.t);
      const values: Record<string, HourValue> = {};
      for (const model of this.models) Object.assign(values, model(c));
      for (const m of REGISTER_METERS) {
        const v = values[m.code];
        if (v?.kind === "energy" && activeOver(m, c.t)) {
          this.registers.get(m.code)!.add(v.kwh);
        }
      }
      if (c.t >= from) yield* this.intervalReadings(c, values);
    }
    if (end >= from) yield* this.registerReads(end);
  }

  private missing(code: string, t: number): boolean {
    return this.gaps.get(code)?.has(t) ?? false;
  }

  private *registerReads(t: number): Generator<ScenarioReading> {
    if (t <= this.registersReadAt) return;
    this.registersReadAt = t;
    const iso = isoSeconds(t);
    for (const m of REGISTER_METERS) {
      if (!activeAt(m, t) || this.missing(m.code, t)) continue;
      const reading = registerReading(
        m,
        iso,
        this.registers.get(m.code)!.read(),
      );
      yield { meter: m.code, reading };
    }
  }

  private *intervalReadings(
    c: HourContext,
    values: Record<string, HourValue>,
  ): Generator<ScenarioReading> {
    const end = isoSeconds(c.t + HOUR_MS);
    for (const m of INTERVAL_METERS) {
      const v = values[m.code];
      if (v === undefined || !activeOver(m, c.t) || this.missing(m.code, c.t)) {
        continue;
      }
      const reading = intervalReading(m, c, end, v);
      if (reading !== undefined) yield { meter: m.code, reading };
    }
  }
}

/**
 * The scenario's readings in [from, to), hour by hour: in each hour the
 * register reads at its start, then the intervals that begin in it; one last
 * round of register reads at `to`, so the register intervals cover the range.
 * The simulation always runs from the scenario's start, so a later `from`
 * gives the same readings as the full run, registers included.
 */
export function* generateReadings(
  range: GenerateRange,
): Generator<ScenarioReading> {
  requireRange(range);
  yield* new ScenarioRun().advance(range.to, range.from);
}

/** The same readings, grouped per meter, each list in time order. */
export function readingsByMeter(
  range: GenerateRange,
): Map<string, GatewayReading[]> {
  const out = new Map<string, GatewayReading[]>();
  for (const { meter, reading } of generateReadings(range)) {
    let list = out.get(meter);
    if (list === undefined) {
      list = [];
      out.set(meter, list);
    }
    list.push(reading);
  }
  return out;
}
