// Water heat against the k-factor table and worked energies of
// references.md §3, all tagged [computed, IF97] there (python3-iapws 1.5.3),
// at 16 bar a, the PN16 pressure that references.md recalls EN 1434-1 using
// for its k tables [memory].

import { describe, expect, it } from "vitest";
import { PhysicsInputError, PhysicsRangeError } from "./errors";
import { heatCoefficientKwhPerM3K, waterHeat } from "./water-heat";

const P16 = 16;
const KJ_PER_KWH = 3600;

describe("heat coefficient k at 16 bar a (references.md §3 [computed])", () => {
  const rows = [
    { f: 75, r: 50, kFlow: 1.13299, kReturn: 1.1483 },
    { f: 90, r: 70, kFlow: 1.12501, kReturn: 1.13949 },
    { f: 60, r: 45, kFlow: 1.14154, kReturn: 1.14967 },
    { f: 45, r: 30, kFlow: 1.14918, kReturn: 1.15549 },
    { f: 7, r: 12, kFlow: 1.1648, kReturn: 1.16431 },
    { f: 10, r: 15, kFlow: 1.16346, kReturn: 1.16274 },
  ];
  for (const { f, r, kFlow, kReturn } of rows) {
    it(`${f}/${r} °C, sensor in flow and in return`, () => {
      expect(heatCoefficientKwhPerM3K(f, r, P16, "flow")).toBeCloseTo(kFlow, 5);
      expect(heatCoefficientKwhPerM3K(f, r, P16, "return")).toBeCloseTo(
        kReturn,
        5,
      );
    });
  }

  it("is higher with the sensor in the (denser) return pipe when heating", () => {
    // references.md §3: ratio return/flow 1.0135 at 75/50 °C [computed].
    const ratio =
      heatCoefficientKwhPerM3K(75, 50, P16, "return")! /
      heatCoefficientKwhPerM3K(75, 50, P16, "flow")!;
    expect(ratio).toBeCloseTo(1.0135, 4);
  });

  it("is undefined (null) when flow and return are equal", () => {
    expect(heatCoefficientKwhPerM3K(50, 50, P16, "flow")).toBeNull();
  });
});

describe("worked energies, V = 1 m³ at 16 bar a (references.md §3 [computed])", () => {
  it("75/50 °C, sensor in return: ρ 988.698 kg/m³, 28.7074 kWh, 103.347 MJ", () => {
    const q = waterHeat({
      volumeM3: 1,
      flowTempC: 75,
      returnTempC: 50,
      pressureBarAbs: P16,
      sensorAt: "return",
    });
    expect(q.densityAtSensorKgPerM3).toBeCloseTo(988.698, 3);
    expect(q.energyKj / KJ_PER_KWH).toBeCloseTo(28.7074, 4);
    expect(q.energyKj / 1000).toBeCloseTo(103.347, 3);
    expect(q.massKg).toBeCloseTo(988.698, 3);
  });

  it("75/50 °C, sensor in flow: ρ 975.520 kg/m³, 28.3248 kWh, 101.969 MJ", () => {
    const q = waterHeat({
      volumeM3: 1,
      flowTempC: 75,
      returnTempC: 50,
      pressureBarAbs: P16,
      sensorAt: "flow",
    });
    expect(q.densityAtSensorKgPerM3).toBeCloseTo(975.52, 3);
    expect(q.energyKj / KJ_PER_KWH).toBeCloseTo(28.3248, 4);
    expect(q.energyKj / 1000).toBeCloseTo(101.969, 3);
  });

  it("7/12 °C chilled water comes out negative by itself: −5.8215 kWh", () => {
    const q = waterHeat({
      volumeM3: 1,
      flowTempC: 7,
      returnTempC: 12,
      pressureBarAbs: P16,
      sensorAt: "return",
    });
    expect(q.energyKj / KJ_PER_KWH).toBeCloseTo(-5.8215, 4);
    expect(q.flowEnthalpyKjPerKg).toBeLessThan(q.returnEnthalpyKjPerKg);
  });

  it("scales with volume and is zero for zero volume", () => {
    const base = { flowTempC: 70, returnTempC: 40, pressureBarAbs: 6 } as const;
    const one = waterHeat({ ...base, volumeM3: 1, sensorAt: "return" });
    const three = waterHeat({ ...base, volumeM3: 3, sensorAt: "return" });
    expect(three.energyKj).toBeCloseTo(3 * one.energyKj, 9);
    expect(waterHeat({ ...base, volumeM3: 0, sensorAt: "flow" }).energyKj).toBe(
      0,
    );
  });
});

describe("water heat input checks", () => {
  const ok = {
    volumeM3: 1,
    flowTempC: 70,
    returnTempC: 40,
    pressureBarAbs: 6,
    sensorAt: "return",
  } as const;

  it("rejects a negative volume", () => {
    expect(() => waterHeat({ ...ok, volumeM3: -1 })).toThrow(PhysicsInputError);
  });

  it("rejects a flow temperature at which the water would boil", () => {
    // T_s(2 bar a) ≈ 120.2 °C [computed, IF97].
    expect(() =>
      waterHeat({ ...ok, pressureBarAbs: 2, flowTempC: 130 }),
    ).toThrow(/flowTempC: .*not liquid/);
  });

  it("rejects temperatures and pressures outside the meter range", () => {
    expect(() => waterHeat({ ...ok, returnTempC: -5 })).toThrow(/returnTempC/);
    expect(() => waterHeat({ ...ok, pressureBarAbs: 50 })).toThrow(
      PhysicsRangeError,
    );
  });
});
