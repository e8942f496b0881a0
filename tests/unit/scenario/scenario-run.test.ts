import { describe, expect, it } from "vitest";
import {
  generateReadings,
  ScenarioRun,
} from "../../../seeds/scenario/generate";
import { isGasRegister } from "../../../seeds/scenario/gas-supplies";
import type { ScenarioReading } from "../../../seeds/scenario/generate";
import {
  METERS,
  SCENARIO_PERIOD,
} from "../../../seeds/scenario/larchmere-estate";

const HOUR_MS = 3_600_000;
const at = (iso: string) => new Date(iso);
const plus = (d: Date, hours: number) =>
  new Date(d.getTime() + hours * HOUR_MS);

describe("ScenarioRun: the scenario stepped hour by hour", () => {
  it("gives, stepped an hour at a time, exactly the readings of one generateReadings call", () => {
    const from = at("2026-11-29T00:00:00Z");
    const to = plus(from, 30);
    const run = new ScenarioRun();
    const stepped: ScenarioReading[] = [...run.advance(plus(from, 1), from)];
    for (let end = plus(from, 2); end <= to; end = plus(end, 1)) {
      stepped.push(...run.advance(end, from));
    }
    expect(stepped).toEqual([...generateReadings({ from, to })]);
    expect(run.position).toEqual(to);
  }, 30_000);

  it("keeps going after the seeded period: one reading per meter and hour, registers climbing", () => {
    const run = new ScenarioRun();
    const from = plus(SCENARIO_PERIOD.to, 24 * 40);
    const readings = [...run.advance(plus(from, 24), from)];
    const perMeter = new Map<string, number>();
    for (const r of readings)
      perMeter.set(r.meter, (perMeter.get(r.meter) ?? 0) + 1);
    for (const m of METERS.filter((x) => !x.removedAt)) {
      // 24 intervals, or 25 register reads (both ends of the day).
      const register =
        m.quantity === "electric_register" || isGasRegister(m.code);
      const expected = register ? 25 : 24;
      expect(perMeter.get(m.code), m.code).toBe(expected);
    }
    const reads = readings
      .filter((r) => r.meter === "CH-EL1")
      .map((r) => (r.reading as { register_kwh: number }).register_kwh);
    expect(reads.at(-1)!).toBeGreaterThan(reads[0]);
  }, 30_000);

  it("only goes forwards, in whole hours", () => {
    const run = new ScenarioRun();
    const from = at("2025-01-01T00:00:00Z");
    expect([...run.advance(from, from)].length).toBeGreaterThan(0);
    expect(() => run.advance(plus(from, -1), from).next()).toThrow(RangeError);
    expect(() => run.advance(at("2025-01-01T00:30:00Z"), from).next()).toThrow(
      RangeError,
    );
  }, 30_000);
});
