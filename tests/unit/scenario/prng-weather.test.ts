import { describe, expect, it } from "vitest";
import { SCENARIO_PERIOD } from "../../../seeds/scenario/larchmere-estate";
import {
  gaussian,
  hashSeed,
  mulberry32,
  streamFor,
} from "../../../seeds/scenario/prng";
import {
  WEATHER,
  dailyMeanTempC,
  dailyWeather,
  heatingDegreeDays,
  hourlyTempC,
  seasonalMeanC,
} from "../../../seeds/scenario/weather";

// Statistical bounds below are loose multiples of the standard error of a
// uniform or normal sample (common practice), so they do not flake; they
// only catch a broken generator.

describe("mulberry32 and friends", () => {
  it("repeats for the same seed and differs for another", () => {
    const a = mulberry32(42);
    const b = mulberry32(42);
    const c = mulberry32(43);
    const xs = Array.from({ length: 5 }, a);
    expect(Array.from({ length: 5 }, b)).toEqual(xs);
    expect(Array.from({ length: 5 }, c)).not.toEqual(xs);
  });

  it("stays in [0, 1) with a mean near 1/2 and variance near 1/12", () => {
    const r = mulberry32(7);
    const n = 100_000;
    let sum = 0;
    let sq = 0;
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const x = r();
      if (!(x >= 0 && x < 1)) outside++;
      sum += x;
      sq += x * x;
    }
    expect(outside).toBe(0);
    const mean = sum / n;
    // σ of the mean = sqrt(1/12 / n) ≈ 0.0009; allow 5σ.
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.005);
    expect(Math.abs(sq / n - mean * mean - 1 / 12)).toBeLessThan(0.003);
  });

  it("hashes names to 32-bit seeds: FNV-1a of '' is its offset basis", () => {
    // The FNV-1a 32-bit offset basis 2166136261 = 0x811c9dc5 (the FNV spec).
    expect(hashSeed("")).toBe(0x811c9dc5);
    expect(hashSeed("CH-HX1")).not.toBe(hashSeed("CH-HX2"));
  });

  it("draws standard normal deviates", () => {
    const r = streamFor("test");
    const n = 50_000;
    const xs = Array.from({ length: n }, () => gaussian(r));
    const mean = xs.reduce((a, b) => a + b, 0) / n;
    const sd = Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / n);
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(sd - 1)).toBeLessThan(0.03);
  });
});

describe("synthetic weather", () => {
  const days = dailyWeather(SCENARIO_PERIOD);

  it("covers the two scenario years, one entry a day", () => {
    expect(days).toHaveLength(730);
    expect(days[0].date).toBe("2024-12-01");
    expect(days.at(-1)!.date).toBe("2026-11-30");
  });

  it("is deterministic", () => {
    expect(dailyWeather(SCENARIO_PERIOD)).toEqual(days);
    expect(dailyMeanTempC("2025-06-01")).toBe(
      days.find((d) => d.date === "2025-06-01")!.meanTempC,
    );
  });

  it("has the stated seasonal sine: 10.5 °C mean, ±7 K, coldest 15 January", () => {
    expect(seasonalMeanC("2026-01-15")).toBeCloseTo(WEATHER.meanC - 7, 6);
    // Half a year later (day 15 + 182.6) the sine is at its top.
    expect(seasonalMeanC("2026-07-16")).toBeCloseTo(WEATHER.meanC + 7, 2);
  });

  it("averages near 10.5 °C with January well below July", () => {
    const mean = days.reduce((a, d) => a + d.meanTempC, 0) / days.length;
    // AR(1) noise with σ ≈ 2.4 K and 730 correlated days: ±0.8 K is loose.
    expect(Math.abs(mean - 10.5)).toBeLessThan(0.8);
    const month = (m: string) => {
      const xs = days.filter((d) => d.date.slice(5, 7) === m);
      return xs.reduce((a, d) => a + d.meanTempC, 0) / xs.length;
    };
    expect(month("07") - month("01")).toBeGreaterThan(9);
  });

  it("keeps daily means inside a plausible lowland range", () => {
    for (const d of days) {
      expect(d.meanTempC).toBeGreaterThan(-10);
      expect(d.meanTempC).toBeLessThan(28);
    }
  });

  it("gives back the day's mean from the hourly values", () => {
    let sum = 0;
    for (let h = 0; h < 24; h++) sum += hourlyTempC(8, h);
    expect(sum / 24).toBeCloseTo(8, 9);
    expect(hourlyTempC(8, 15)).toBe(11);
  });

  it("counts heating degree days as max(base − mean, 0)", () => {
    expect(heatingDegreeDays(5.5, 15.5)).toBe(10);
    expect(heatingDegreeDays(18, 15.5)).toBe(0);
  });

  it("rejects dates before its epoch", () => {
    expect(() => dailyMeanTempC("2023-12-31")).toThrow(RangeError);
  });
});
