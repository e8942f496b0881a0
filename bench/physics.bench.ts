// Throughput of the water-heat path, measured side by side in one run:
//
//   evaluateItem  the API item path: zod parse, range and phase guards,
//                 the two states, details
//   waterHeat     the physics function alone (guards + flow and return
//                 states: ρ, h and s from region 1's first-order sums)
//   IF97 region 1 one bare region1Properties call (guard, all seven
//                 properties with cp and the speed of sound), the unit of cost
//
// waterHeat can beat one bare region-1 call: it sums only γ, γπ and γτ,
// unrolled, and checks the saturation line once for both states
// (docs/performance.md). The inputs are realistic and varied (heating and
// chilled water circuits), drawn from a seeded generator so every run sees
// the same.
//
// A second table gives the evaluations per second of the fuel quantities
// (gas_volume, liquid_fuel, hydrogen, solid_fuel) and of water_heat with ambient_temp_c
// (the exergy), each through the API item path.

import { performance } from "node:perf_hooks";
import os from "node:os";
import { evaluateItem } from "../app/physics/evaluate";
import { region1Properties } from "../app/physics/if97";
import { waterHeat } from "../app/physics/water-heat";
import type { WaterHeatInput } from "../app/physics/water-heat";
import { printAim, printBenchLine } from "./aims";

// Issue #17: one core evaluates at least a million water-heat items a second.
const WATER_HEAT_AIM_PER_S = 1_000_000;

const ITEMS = 200_000;
const WARM_UP_ITEMS = 20_000;
const ROUNDS = 5;

// mulberry32: a small seeded PRNG, enough for spreading bench inputs.
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface Case {
  item: Record<string, unknown>;
  input: WaterHeatInput;
  flowPressureMpa: number;
  flowTemperatureK: number;
}

// Nine in ten are heating circuits (flow 40-95 °C, ΔT 5-30 K), one in ten
// chilled water (flow 5-12 °C, return 4-8 K warmer); 1.5-16 bar a; hourly
// volumes 0.01-5 m³; the flow sensor in either pipe.
function cases(n: number): Case[] {
  const r = random(20260301);
  const out: Case[] = [];
  for (let i = 0; i < n; i++) {
    const chilled = r() < 0.1;
    const flowTempC = chilled ? 5 + 7 * r() : 40 + 55 * r();
    const returnTempC = chilled
      ? flowTempC + 4 + 4 * r()
      : flowTempC - 5 - 25 * r();
    const pressureBarAbs = 1.5 + 14.5 * r();
    const volumeM3 = 0.01 + 4.99 * r();
    const sensorAt = r() < 0.5 ? "flow" : "return";
    out.push({
      item: {
        quantity: "water_heat",
        volume_m3: volumeM3,
        flow_temp_c: flowTempC,
        return_temp_c: returnTempC,
        pressure_bar_abs: pressureBarAbs,
        sensor_at: sensorAt,
      },
      input: { volumeM3, flowTempC, returnTempC, pressureBarAbs, sensorAt },
      flowPressureMpa: pressureBarAbs / 10,
      flowTemperatureK: flowTempC + 273.15,
    });
  }
  return out;
}

interface Loop {
  name: string;
  what: string;
  // Runs over cases[0, n) and returns a checksum, so no work is optimised away.
  run: (cs: Case[], n: number) => number;
}

const LOOPS: Loop[] = [
  {
    name: "evaluateItem",
    what: "API item: parse + physics + details",
    run: (cs, n) => {
      let sum = 0;
      for (let i = 0; i < n; i++) {
        const r = evaluateItem(cs[i].item);
        if (!r.ok) throw new Error(`bench item ${i} failed: ${r.error}`);
        sum += r.energy_kwh;
      }
      return sum;
    },
  },
  {
    name: "waterHeat",
    what: "physics function alone",
    run: (cs, n) => {
      let sum = 0;
      for (let i = 0; i < n; i++) sum += waterHeat(cs[i].input).energyKj;
      return sum;
    },
  },
  {
    name: "IF97 region 1",
    what: "one bare region1Properties call",
    run: (cs, n) => {
      let sum = 0;
      for (let i = 0; i < n; i++) {
        const c = cs[i];
        sum += region1Properties(
          c.flowPressureMpa,
          c.flowTemperatureK,
        ).enthalpyKjPerKg;
      }
      return sum;
    },
  },
];

// The fastest round: interference from other processes only ever adds time.
function best(xs: number[]): number {
  return Math.min(...xs);
}

// Text left-aligned, numbers right-aligned, columns two spaces apart.
function printTable(head: string[], body: string[][]): void {
  const widths = head.map((h, c) =>
    Math.max(h.length, ...body.map((row) => row[c].length)),
  );
  const numeric = (c: number) => body.every((row) => /^[\d.,×]+$/.test(row[c]));
  const line = (cells: string[]) =>
    cells
      .map((cell, c) =>
        numeric(c) ? cell.padStart(widths[c]) : cell.padEnd(widths[c]),
      )
      .join("  ")
      .trimEnd();
  console.log(line(head));
  console.log(widths.map((w) => "-".repeat(w)).join("  "));
  for (const row of body) console.log(line(row));
}

function formatRate(opsPerSecond: number): string {
  return Math.round(opsPerSecond).toLocaleString("en-GB");
}

// Varied, valid items of the quantities added for fuels and exergy.
function fuelItems(n: number): Record<string, Record<string, unknown>[]> {
  const r = random(20261205);
  const gas = [];
  const oil = [];
  const hydrogen = [];
  const biomass = [];
  const exergy = [];
  for (let i = 0; i < n; i++) {
    // Half the gas items corrected from line conditions, a quarter by a
    // stated factor, a quarter in hundreds of ft³ already at reference.
    const kind = r();
    gas.push({
      quantity: "gas_volume",
      ...(kind < 0.75
        ? { volume_m3: 1 + 500 * r() }
        : { volume_ft3: 100 * Math.ceil(50 * r()) }),
      calorific_value_mj_m3: 37.5 + 5.5 * r(),
      ...(kind < 0.5
        ? { gas_temp_c: -5 + 25 * r(), gas_pressure_mbar_g: 21 + 300 * r() }
        : kind < 0.75
          ? { correction_factor: 1.02264 }
          : {}),
    });
    const opening = 2000 + 8000 * r();
    oil.push({
      quantity: "liquid_fuel",
      ...(r() < 0.5
        ? { volume_l: 10 + 990 * r() }
        : {
            opening_stock_l: opening,
            deliveries_l: r() < 0.3 ? 5000 : 0,
            closing_stock_l: opening * r(),
          }),
      density_kg_l: 0.78 + 0.08 * r(),
      calorific_value_mj_kg: 45 + 1.5 * r(),
    });
    hydrogen.push({
      quantity: "hydrogen",
      ...(r() < 0.5 ? { mass_kg: 50 * r() } : { volume_nm3: 500 * r() }),
      basis: r() < 0.5 ? "gross" : "net",
    });
    // Half as received (pellets, chips), half a dry-basis CV with moisture.
    biomass.push({
      quantity: "solid_fuel",
      mass_kg: 1 + 500 * r(),
      ...(r() < 0.5
        ? { calorific_value_mj_kg: 12 + 6 * r() }
        : {
            calorific_value_mj_kg: 18 + 2 * r(),
            cv_moisture_basis: "dry",
            moisture_percent: 8 + 40 * r(),
          }),
      cv_basis: r() < 0.5 ? "gross" : "net",
    });
    const chilled = r() < 0.2;
    const flow = chilled ? 5 + 5 * r() : 45 + 45 * r();
    exergy.push({
      quantity: "water_heat",
      volume_m3: 0.01 + 4.99 * r(),
      flow_temp_c: flow,
      return_temp_c: chilled ? flow + 5 : flow - 5 - 20 * r(),
      pressure_bar_abs: 1.5 + 14.5 * r(),
      sensor_at: "return",
      ambient_temp_c: chilled ? 20 + 12 * r() : -10 + 25 * r(),
    });
  }
  return {
    gas_volume: gas,
    liquid_fuel: oil,
    hydrogen,
    solid_fuel: biomass,
    "water_heat + exergy": exergy,
  };
}

function evaluateAll(items: Record<string, unknown>[], n: number): number {
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const r = evaluateItem(items[i]);
    if (!r.ok) throw new Error(`bench item ${i} failed: ${r.error}`);
    sum += r.energy_kwh;
  }
  return sum;
}

/** Evaluations per second of the fuel quantities and of the exergy. */
async function benchFuels(): Promise<number> {
  const byQuantity = fuelItems(ITEMS);
  let sink = 0;
  const names = Object.keys(byQuantity);
  for (const name of names)
    sink += evaluateAll(byQuantity[name], WARM_UP_ITEMS);
  const times = new Map<string, number[]>(names.map((q) => [q, []]));
  for (let round = 0; round < ROUNDS; round++) {
    for (const name of names) {
      const t0 = performance.now();
      sink += evaluateAll(byQuantity[name], ITEMS);
      times.get(name)!.push(performance.now() - t0);
      await new Promise((resolve) => setImmediate(resolve));
    }
  }
  console.log(
    `\nfuels and exergy: ${ITEMS.toLocaleString("en-GB")} varied items ` +
      `each through evaluateItem, best of ${ROUNDS} rounds\n`,
  );
  printTable(
    ["quantity", "ms", "evaluations/s", "µs/op"],
    names.map((name) => {
      const ms = best(times.get(name)!);
      return [
        name,
        ms.toFixed(0),
        formatRate((ITEMS / ms) * 1000),
        ((1000 * ms) / ITEMS).toFixed(2),
      ];
    }),
  );
  return sink;
}

/** Prints water-heat evaluations per second beside bare IF97 region-1 calls. */
export async function benchPhysics(): Promise<void> {
  const cs = cases(ITEMS);
  let sink = 0;

  // Warm-up: let the JIT compile every path before anything is timed.
  for (const loop of LOOPS) sink += loop.run(cs, WARM_UP_ITEMS);

  // Rounds interleave the loops so a slow spell of the machine hits all alike.
  const times = new Map<string, number[]>(LOOPS.map((l) => [l.name, []]));
  // Process CPU time beside the wall time: on a machine shared with other
  // work the wall time counts the waits for a core, the CPU time does not.
  const cpuTimes = new Map<string, number[]>(LOOPS.map((l) => [l.name, []]));
  for (let round = 0; round < ROUNDS; round++) {
    for (const loop of LOOPS) {
      const c0 = process.cpuUsage();
      const t0 = performance.now();
      sink += loop.run(cs, ITEMS);
      times.get(loop.name)!.push(performance.now() - t0);
      const cpu = process.cpuUsage(c0);
      cpuTimes.get(loop.name)!.push((cpu.user + cpu.system) / 1000);
      // Yield between loops so the event loop and GC are not starved.
      await new Promise((resolve) => setImmediate(resolve));
    }
  }

  const rows = LOOPS.map((loop) => {
    const ms = best(times.get(loop.name)!);
    const cpuMs = best(cpuTimes.get(loop.name)!);
    return {
      loop,
      ms,
      opsPerSecond: (ITEMS / ms) * 1000,
      cpuOpsPerSecond: (ITEMS / cpuMs) * 1000,
    };
  });
  const region1 = rows[rows.length - 1].opsPerSecond;

  const cpu = os.cpus()[0]?.model ?? "unknown CPU";
  console.log(
    `physics: ${ITEMS.toLocaleString("en-GB")} varied water-heat items, ` +
      `${WARM_UP_ITEMS.toLocaleString("en-GB")} warm-up, best of ${ROUNDS} ` +
      `rounds (Node ${process.version}, ${cpu}, ${os.cpus().length} CPUs)\n`,
  );
  printTable(
    ["loop", "measures", "ms", "ops/s", "µs/op", "vs region 1", "ops/CPU-s"],
    rows.map(({ loop, ms, opsPerSecond, cpuOpsPerSecond }) => [
      loop.name,
      loop.what,
      ms.toFixed(0),
      formatRate(opsPerSecond),
      ((1000 * ms) / ITEMS).toFixed(2),
      `${(opsPerSecond / region1).toFixed(3)}×`,
      formatRate(cpuOpsPerSecond),
    ]),
  );
  const evaluate = rows[0].opsPerSecond;
  console.log(
    `\nratio: evaluateItem / waterHeat = ` +
      `${(evaluate / rows[1].opsPerSecond).toFixed(2)} (what the API item's ` +
      `parse and details add to the physics).`,
  );
  sink += await benchFuels();
  // Printing the checksum keeps every timed result observable.
  console.log(`checksum ${sink.toExponential(6)}\n`);
  const waterHeat = rows[1];
  printAim(
    "waterHeat evaluations/s",
    `${formatRate(waterHeat.opsPerSecond)} (${formatRate(waterHeat.cpuOpsPerSecond)} per CPU-second)`,
    `≥ ${formatRate(WATER_HEAT_AIM_PER_S)}/s on one core`,
    waterHeat.opsPerSecond >= WATER_HEAT_AIM_PER_S,
  );
  printBenchLine("physics", [["water_heat_per_s", waterHeat.opsPerSecond]]);
}
