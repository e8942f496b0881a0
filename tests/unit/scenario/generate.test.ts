import { beforeAll, describe, expect, it } from "vitest";
import { estimateGaps } from "../../../app/ingest/estimate";
import { registerDeltas } from "../../../app/ingest/register-series";
import type { IntervalPoint } from "../../../app/ingest/series";
import { findGaps } from "../../../app/ingest/validate";
import {
  generateReadings,
  readingsByMeter,
} from "../../../seeds/scenario/generate";
import type {
  GatewayReading,
  RegisterReading,
  ScenarioReading,
} from "../../../seeds/scenario/generate";
import {
  METERS,
  SCENARIO_GAPS,
  SCENARIO_PERIOD,
  SCHOOL_METER_SWAP_AT,
  meterByCode,
} from "../../../seeds/scenario/larchmere-estate";
import { hashSeed } from "../../../seeds/scenario/prng";
import {
  demoCvSeries,
  isGasRegister,
} from "../../../seeds/scenario/gas-supplies";
import { isAnyRegister, isRegister } from "./support";

// Expected counts are arithmetic on the scenario's definition: 730 days ×
// 24 = 17 520 hourly intervals, 17 521 register reads (both ends), less the
// hours of the gaps in SCENARIO_GAPS.

const HOURS = 17_520;
const HOUR_MS = 3_600_000;

let byMeter: Map<string, GatewayReading[]>;
let total = 0;
let generationMs = 0;
let firstFingerprint = "";

function fingerprint(readings: Iterable<ScenarioReading>): string {
  let h = 0;
  let n = 0;
  for (const r of readings) {
    h = (Math.imul(h, 31) + hashSeed(JSON.stringify(r))) >>> 0;
    n++;
  }
  return `${n}:${h}`;
}

// Groups the readings per meter while passing them through unchanged, so
// the first run serves both the fingerprint and the per-meter checks.
function* collect(readings: Iterable<ScenarioReading>) {
  for (const r of readings) {
    let list = byMeter.get(r.meter);
    if (list === undefined) {
      list = [];
      byMeter.set(r.meter, list);
    }
    list.push(r.reading);
    total++;
    yield r;
  }
}

function gapHoursOf(code: string): number {
  return SCENARIO_GAPS.filter((g) => g.meter === code).reduce(
    (a, g) => a + g.hours,
    0,
  );
}

function registerReads(code: string): RegisterReading[] {
  return (byMeter.get(code) ?? []).filter(isRegister);
}

function startOf(r: GatewayReading): string {
  return isAnyRegister(r) ? r.time : r.start;
}

beforeAll(() => {
  byMeter = new Map();
  const t0 = performance.now();
  const all = [...generateReadings(SCENARIO_PERIOD)];
  generationMs = performance.now() - t0;
  firstFingerprint = fingerprint(collect(all));
}, 60_000);

describe("generateReadings", () => {
  it("is fast: two years of all meters in a few seconds", () => {
    // Measured about 0.6 s on the development machine; a busy CI runner may
    // be several times slower, hence the loose bound.
    expect(generationMs).toBeLessThan(15_000);
    expect(total).toBeGreaterThan(300_000);
  });

  it("is deterministic: the same readings twice", () => {
    const again = fingerprint(generateReadings(SCENARIO_PERIOD));
    expect(again).toBe(firstFingerprint);
    expect(again.startsWith(`${total}:`)).toBe(true);
  }, 60_000);

  it("gives a later sub-range the same readings as the full run", () => {
    const range = {
      from: new Date("2025-11-05T12:00:00Z"),
      to: new Date("2025-11-06T00:00:00Z"),
    };
    const part = [...generateReadings(range)].map((r) => r.reading);
    const fromFull = [...byMeter.values()].flat().filter((r) => {
      const t = Date.parse(startOf(r));
      return (
        t >= range.from.getTime() &&
        t <= range.to.getTime() &&
        (isAnyRegister(r) || t < range.to.getTime())
      );
    });
    const key = (r: GatewayReading) => `${r.meter}@${startOf(r)}`;
    const sort = (xs: GatewayReading[]) =>
      [...xs].sort((x, y) => key(x).localeCompare(key(y)));
    expect(sort(part)).toEqual(sort(fromFull));
  }, 60_000);

  it("groups the same readings per meter in readingsByMeter", () => {
    const range = {
      from: new Date("2025-03-03T00:00:00Z"),
      to: new Date("2025-03-03T06:00:00Z"),
    };
    const grouped = readingsByMeter(range);
    // Hours 02–06 of LP-HX1 are a scenario gap: 2 of 6 intervals remain.
    expect(grouped.get("LP-HX1")).toHaveLength(2);
    expect(grouped.get("CH-EL1")).toHaveLength(7);
  });

  it("rejects ranges before the scenario or off the hour", () => {
    const to = new Date("2025-01-01T00:00:00Z");
    expect(() =>
      generateReadings({ from: new Date("2024-11-30T00:00:00Z"), to }).next(),
    ).toThrow(RangeError);
    expect(() =>
      generateReadings({ from: new Date("2024-12-01T00:30:00Z"), to }).next(),
    ).toThrow(RangeError);
  });

  it("sends every meter's readings in the gateway shape with its own code", () => {
    // Violations are collected and compared once: an expect per reading
    // would cost seconds over 300 000 readings.
    const wrong: string[] = [];
    for (const [code, list] of byMeter) {
      const m = meterByCode(code);
      for (const r of list) {
        // A gas register's reads are gas_register reads of a gas_volume meter.
        const quantity = isGasRegister(code) ? "gas_register" : m.quantity;
        if (r.meter !== code || r.quantity !== quantity) {
          wrong.push(`${code}: ${JSON.stringify(r)}`);
        }
      }
    }
    expect(wrong).toEqual([]);
    expect([...byMeter.keys()].sort()).toEqual(
      METERS.map((m) => m.code).sort(),
    );
  });

  it("has one reading per hour per meter, less the gaps", () => {
    for (const m of METERS) {
      if (m.removedAt !== undefined || m.code === "NP-EL2") continue;
      const expected =
        (m.quantity === "electric_register" || isGasRegister(m.code)
          ? HOURS + 1
          : HOURS) - gapHoursOf(m.code);
      expect(byMeter.get(m.code)!.length, m.code).toBe(expected);
    }
  });

  it("stamps intervals as whole hours, ISO 8601 without milliseconds", () => {
    for (const r of byMeter.get("CH-HX1")!.slice(0, 50)) {
      if (isAnyRegister(r)) throw new Error("not an interval");
      expect(r.start).toMatch(/^\d{4}-\d\d-\d\dT\d\d:00:00Z$/);
      expect(Date.parse(r.end) - Date.parse(r.start)).toBe(HOUR_MS);
    }
  });
});

function outOfRange(r: GatewayReading): string | null {
  const within = (x: number, lo: number, hi: number) => x >= lo && x <= hi;
  if (r.quantity === "water_heat") {
    const ok =
      within(r.flow_temp_c, 5, 95) &&
      within(r.return_temp_c, 5, 95) &&
      within(r.pressure_bar_abs, 1, 16) &&
      r.volume_m3 >= 0;
    return ok ? null : "water outside 5–95 °C, 1–16 bar a or volume < 0";
  }
  if (r.quantity === "steam_heat") {
    // Condensate stays below T_s(3 bar g) ≈ 143.6 °C [IF97 region 4, at
    // 4.01 bar a; rounded], so it is never hotter than saturation.
    const ok =
      within(r.pressure_bar_g, 3, 10) &&
      r.mass_kg >= 0 &&
      r.condensate_temp_c < 143;
    return ok ? null : "steam outside 3–10 bar g, or condensate too hot";
  }
  if (r.quantity === "gas_volume") {
    // The CV comes from the supply's series (checked below).
    return r.volume_m3 >= 0 ? null : "gas volume < 0";
  }
  if (r.quantity === "gas_register") {
    return r.register_hcf >= 0 && r.register_hcf < 10_000
      ? null
      : "gas register outside 0 to its roll-over at 10,000 hcf";
  }
  if (r.quantity === "hydrogen") {
    return r.mass_kg >= 0 ? null : "negative hydrogen mass";
  }
  return r.register_kwh >= 0 ? null : "negative register";
}

describe("the gas supplies' calorific values", () => {
  it("are plausible gross values, 38.5–40.0 MJ/m³, for every month from the scenario's start", () => {
    // GB natural gas is 37.5–43 MJ/m³ gross (references.md §9, common practice).
    const series = demoCvSeries();
    expect(series[0].period).toBe("2024-12");
    expect(series.length).toBeGreaterThanOrEqual(24);
    for (const { cv } of series) {
      expect(cv).toBeGreaterThanOrEqual(38.5);
      expect(cv).toBeLessThanOrEqual(40);
    }
    // Not one flat figure: the supply's gas varies month to month.
    expect(new Set(series.map((s) => s.cv)).size).toBeGreaterThan(6);
  });
});

describe("physical ranges of the raw readings", () => {
  it("keeps water at 5–95 °C and 1–16 bar a, steam at 3–10 bar g", () => {
    const wrong: string[] = [];
    for (const list of byMeter.values()) {
      for (const r of list) {
        const why = outOfRange(r);
        if (why !== null) wrong.push(`${why}: ${JSON.stringify(r)}`);
      }
    }
    expect(wrong).toEqual([]);
  });
});

describe("scenario events", () => {
  it("rolls the library register over exactly once", () => {
    const reads = registerReads("RL-EL1");
    const drops = reads.filter(
      (r, i) => i > 0 && r.register_kwh < reads[i - 1].register_kwh,
    );
    expect(drops).toHaveLength(1);
    for (const r of reads) expect(r.register_kwh).toBeLessThan(100_000);
    const deltas = registerDeltas(
      reads.map((r) => ({
        time: new Date(r.time),
        registerKwh: r.register_kwh,
      })),
      { capacityKwh: 100_000 },
    );
    expect(deltas.filter((d) => d.flag === "rollover")).toHaveLength(1);
    expect(deltas.filter((d) => d.flag === "register_drop")).toHaveLength(0);
  });

  it("never lets any other register fall", () => {
    const falls: string[] = [];
    for (const m of METERS) {
      if (m.quantity !== "electric_register" || m.code === "RL-EL1") continue;
      const reads = registerReads(m.code);
      for (let i = 1; i < reads.length; i++) {
        if (reads[i].register_kwh < reads[i - 1].register_kwh) {
          falls.push(`${m.code} at ${reads[i].time}`);
        }
      }
    }
    expect(falls).toEqual([]);
  });

  it("swaps the school meter: old one ends, new one starts near 0, same hour", () => {
    const old = registerReads("NP-EL1");
    const next = registerReads("NP-EL2");
    expect(old.at(-1)!.time).toBe(SCHOOL_METER_SWAP_AT.replace(".000", ""));
    expect(next[0].time).toBe(old.at(-1)!.time);
    expect(old.at(-1)!.register_kwh).toBeGreaterThan(200_000);
    expect(next[0].register_kwh).toBeLessThan(10);
    expect(old[0].time).toBe("2024-12-01T00:00:00Z");
    expect(next.at(-1)!.time).toBe("2026-12-01T00:00:00Z");
    // Together they read every hour once, the swap hour twice (once each).
    expect(old.length + next.length).toBe(HOURS + 2);
  });

  it("leaves out exactly the gap hours, with data on both sides", () => {
    for (const g of SCENARIO_GAPS) {
      const starts = new Set(byMeter.get(g.meter)!.map(startOf));
      const t0 = Date.parse(g.start);
      const iso = (t: number) => new Date(t).toISOString().replace(".000", "");
      for (let k = 0; k < g.hours; k++) {
        expect(starts.has(iso(t0 + k * HOUR_MS)), g.meter).toBe(false);
      }
      expect(starts.has(iso(t0 - HOUR_MS))).toBe(true);
      expect(starts.has(iso(t0 + g.hours * HOUR_MS))).toBe(true);
    }
  });

  it("shows the long school gap to the ingest checks, and it is estimable", () => {
    const series: IntervalPoint[] = byMeter.get("NP-HX1")!.map((r) => ({
      intervalStart: new Date(startOf(r)),
      // Stand-in energy (volume) is enough to check placement here.
      energyKwh: r.quantity === "water_heat" ? r.volume_m3 : 0,
      quality: "measured",
    }));
    const gaps = findGaps(series, SCENARIO_PERIOD.from, SCENARIO_PERIOD.to);
    expect(gaps).toEqual([
      { start: new Date("2026-01-19T08:00:00Z"), hours: 72, edge: null },
    ]);
    const estimates = estimateGaps(series, { timeZone: "Europe/London" });
    expect(estimates).toHaveLength(72);
    expect(estimates.every((e) => e.method === "profile")).toBe(true);
  });
});
