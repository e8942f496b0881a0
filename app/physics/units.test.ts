import { describe, expect, it } from "vitest";
import { PhysicsInputError } from "./errors";
import { ENERGY_UNITS, convertEnergy, isEnergyUnit } from "./units";
import type { EnergyUnit } from "./units";
import { expectRelativeClose } from "./test-helpers";

describe("energy unit table", () => {
  it("1 kWh is 3.6 MJ exactly", () => {
    // NIST SP 811 (2008) App. B.8 [memory]; BS 350:2004 [read] (references.md §4).
    expect(convertEnergy(1, "kWh", "J")).toBe(3.6e6);
    expect(convertEnergy(1, "kWh", "MJ")).toBe(3.6);
    expect(convertEnergy(1, "GWh", "GJ")).toBe(3600);
  });

  it("1 Btu_IT is 1055.055 852 62 J exactly", () => {
    // BS 350:2004 note [read]; NIST SP 811 B.8 footnote [memory].
    expect(convertEnergy(1, "Btu", "J")).toBe(1055.05585262);
  });

  it("derives the Btu_IT from the IT calorie and the pound", () => {
    // references.md §4: 4.1868 J/(g·K) × 453.592 37 g × 5/9 (exact definitions).
    expectRelativeClose(
      convertEnergy(1, "Btu", "J"),
      (4.1868 * 453.59237 * 5) / 9,
      1e-15,
    );
  });

  it("1 kWh is 3412.141 63 Btu_IT", () => {
    // references.md §4, derived.
    expect(convertEnergy(1, "kWh", "Btu")).toBeCloseTo(3412.14163, 5);
  });

  it("tells the therm (EC) from the therm (US)", () => {
    // references.md §4 and §8: 105.505 585 262 MJ (EC), 105.4804 MJ (US);
    // 29.3071 and 29.3001 kWh.
    expect(convertEnergy(1, "therm_ec", "MJ")).toBeCloseTo(105.505585262, 9);
    expect(convertEnergy(1, "therm_us", "MJ")).toBeCloseTo(105.4804, 9);
    expect(convertEnergy(1, "therm_ec", "kWh")).toBeCloseTo(29.3071, 4);
    expect(convertEnergy(1, "therm_us", "kWh")).toBeCloseTo(29.3001, 4);
  });

  it("1 MMBtu is 1055.055 852 62 MJ = 293.071 070 kWh", () => {
    // references.md §4, derived.
    expectRelativeClose(convertEnergy(1, "MMBtu", "MJ"), 1055.05585262, 1e-15);
    expect(convertEnergy(1, "MMBtu", "kWh")).toBeCloseTo(293.07107, 6);
  });

  it("round-trips every unit pair", () => {
    const units = Object.keys(ENERGY_UNITS) as EnergyUnit[];
    for (const a of units) {
      for (const b of units) {
        expectRelativeClose(
          convertEnergy(convertEnergy(123.456, a, b), b, a),
          123.456,
          1e-14,
        );
      }
    }
  });

  it("gives every factor a source", () => {
    for (const def of Object.values(ENERGY_UNITS)) {
      expect(def.source.length).toBeGreaterThan(5);
      expect(def.joules).toBeGreaterThan(0);
    }
  });

  it("rejects unknown units and non-finite values", () => {
    expect(isEnergyUnit("therm")).toBe(false);
    expect(isEnergyUnit("toString")).toBe(false);
    expect(() => convertEnergy(1, "therm" as EnergyUnit, "J")).toThrow(
      PhysicsInputError,
    );
    expect(() => convertEnergy(Number.NaN, "J", "kJ")).toThrow(/finite/);
  });
});
