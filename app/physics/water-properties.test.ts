// Meter-facing water and steam properties: handbook-style values from
// references.md §2 (each tagged as there) and the range and phase guards.

import { describe, expect, it } from "vitest";
import { PhysicsRangeError } from "./errors";
import { expectRelativeClose } from "./test-helpers";
import {
  METER_RANGE,
  absolutePressureBar,
  latentHeatKjPerKg,
  liquidWater,
  saturatedLiquidEnthalpyKjPerKg,
  saturatedVapourEnthalpyKjPerKg,
  saturationAtPressure,
  saturationPressureBarAbs,
  saturationTemperatureC,
  steam,
} from "./water-properties";

const ATM_BAR = 1.01325;

describe("saturated steam at typical gauge pressures", () => {
  // references.md §2, steam-system table [computed, IF97 with python3-iapws],
  // gauge converted with +1.01325 bar (common practice).
  const rows = [
    { g: 0, ts: 99.974, hf: 418.99, hg: 2675.53, hfg: 2256.54, rho: 0.5976 },
    { g: 3, ts: 143.732, hf: 605.24, hg: 2738.21, hfg: 2132.97, rho: 2.1694 },
    { g: 7, ts: 170.482, hf: 721.32, hg: 2768.37, hfg: 2047.05, rho: 4.1675 },
    { g: 10, ts: 184.123, hf: 781.43, hg: 2780.71, hfg: 1999.28, rho: 5.6423 },
  ];
  for (const r of rows) {
    it(`${r.g} bar g matches references.md §2 [computed] to its printed digits`, () => {
      const s = saturationAtPressure(absolutePressureBar(r.g));
      expect(s.temperatureC).toBeCloseTo(r.ts, 3);
      expect(s.liquidEnthalpyKjPerKg).toBeCloseTo(r.hf, 2);
      expect(s.vapourEnthalpyKjPerKg).toBeCloseTo(r.hg, 2);
      expect(s.latentHeatKjPerKg).toBeCloseTo(r.hfg, 2);
      expect(s.vapourDensityKgPerM3).toBeCloseTo(r.rho, 4);
    });
  }

  it("gives h_fg = h_g − h_f through the single-value helpers", () => {
    const p = absolutePressureBar(3);
    const hfg =
      saturatedVapourEnthalpyKjPerKg(p) - saturatedLiquidEnthalpyKjPerKg(p);
    expect(latentHeatKjPerKg(p)).toBeCloseTo(hfg, 10);
  });

  it("shows the '7 bar read as absolute' pitfall of references.md §2", () => {
    // references.md §2 pitfalls [computed]: t_s = 164.95 °C, h_fg = 2065.61.
    expect(saturationTemperatureC(7)).toBeCloseTo(164.95, 2);
    expect(latentHeatKjPerKg(7)).toBeCloseTo(2065.61, 2);
  });
});

describe("latent heat at atmospheric pressure", () => {
  it("is 2256.54 kJ/kg at 101.325 kPa (IF97)", () => {
    // references.md §2 [computed, IF97]: 2256.54 kJ/kg, T_s = 99.974 °C.
    expect(latentHeatKjPerKg(ATM_BAR)).toBeCloseTo(2256.54, 2);
  });

  it("agrees with the trade's 2256 kJ/kg at standard atmospheric pressure", () => {
    // references.md §2: "2256 kJ/kg (970 Btu/lb) at standard atmospheric
    // pressure" [read: an online analytical almanac on latent heat].
    expect(Math.abs(latentHeatKjPerKg(ATM_BAR) - 2256)).toBeLessThan(1);
  });

  it("is 2256.47 kJ/kg at 100 °C (IF97), 2256.4 in IAPWS-95 tables", () => {
    // references.md §2 [computed, IF97] 2256.47; the CRC/NIST 2256.4 kJ/kg is
    // IAPWS-95 [memory], so IF97 may differ from it by a few 0.01 %.
    const hfg = latentHeatKjPerKg(saturationPressureBarAbs(100));
    expect(hfg).toBeCloseTo(2256.47, 2);
    expectRelativeClose(hfg, 2256.4, 1e-4);
  });
});

describe("liquid water at 101.325 kPa", () => {
  // references.md §2 "Liquid water at p = 101.325 kPa" [computed, IF97].
  const rows = [
    { t: 4, rho: 999.975, h: 16.913, cp: 4.2074 },
    { t: 10, rho: 999.702, h: 42.119, cp: 4.1955 },
    { t: 20, rho: 998.206, h: 84.013, cp: 4.1848 },
    { t: 25, rho: 997.048, h: 104.929, cp: 4.1819 },
    { t: 40, rho: 992.224, h: 167.624, cp: 4.1786 },
    { t: 70, rho: 977.779, h: 293.075, cp: 4.1881 },
    { t: 90, rho: 965.319, h: 376.993, cp: 4.205 },
  ];
  for (const r of rows) {
    it(`at ${r.t} °C matches references.md §2 [computed, IF97]`, () => {
      const w = liquidWater(ATM_BAR, r.t);
      expect(w.densityKgPerM3).toBeCloseTo(r.rho, 3);
      expect(w.enthalpyKjPerKg).toBeCloseTo(r.h, 3);
      // One unit of the last printed digit: at 10 °C IF97 gives c_p =
      // 4.1954459, which references.md prints as 4.1955 (a rounding of
      // 4.19545); region 1 itself is verified to 1e-8 in if97.test.ts.
      expect(Math.abs(w.isobaricHeatCapacityKjPerKgK - r.cp)).toBeLessThan(
        1e-4,
      );
    });
  }

  it("stays within 0.02 kg/m³ of the CRC handbook densities", () => {
    // references.md §2: CRC densities (IAPWS-95 based) [memory]; IF97 differs
    // from IAPWS-95 by up to 0.014 kg/m³ here ([computed] table).
    const crc = [
      { t: 10, rho: 999.7 },
      { t: 40, rho: 992.22 },
      { t: 70, rho: 977.76 },
      { t: 90, rho: 965.31 },
    ];
    for (const { t, rho } of crc) {
      expect(
        Math.abs(liquidWater(ATM_BAR, t).densityKgPerM3 - rho),
      ).toBeLessThan(0.02);
    }
  });

  it("gives 209.104 kJ/kg from 10 to 60 °C (references.md §8)", () => {
    // references.md §8 [computed]: h(60 °C) − h(10 °C) = 251.223 − 42.119.
    const dh =
      liquidWater(ATM_BAR, 60).enthalpyKjPerKg -
      liquidWater(ATM_BAR, 10).enthalpyKjPerKg;
    expect(dh).toBeCloseTo(209.104, 3);
  });
});

describe("meter range and phase guards", () => {
  it("names the meter range when a temperature is outside it", () => {
    expect(() => liquidWater(16, 260)).toThrow(PhysicsRangeError);
    expect(() => liquidWater(16, 260)).toThrow(/0 °C to 250 °C/);
    expect(() => liquidWater(16, -1)).toThrow(/meter range/);
  });

  it("names the meter range when a pressure is outside it", () => {
    expect(() => liquidWater(41, 50)).toThrow(/0\.006 bar a to 40 bar a/);
    expect(() => liquidWater(0.005, 50)).toThrow(PhysicsRangeError);
  });

  it("reports the caller's field name", () => {
    try {
      liquidWater(16, 300, { temperature: "flowTempC" });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(PhysicsRangeError);
      expect((e as PhysicsRangeError).field).toBe("flowTempC");
    }
  });

  it("rejects liquid above saturation instead of extrapolating region 1", () => {
    // 120 °C at 1.01325 bar a boils: T_s = 99.974 °C (references.md §2).
    expect(() => liquidWater(ATM_BAR, 120)).toThrow(
      /not liquid.*saturation pressure/,
    );
  });

  it("rejects steam below saturation instead of extrapolating region 2", () => {
    expect(() => steam(ATM_BAR, 90)).toThrow(/below saturation/);
    // Just above T_s the steam is superheated and accepted.
    expect(steam(ATM_BAR, 120).enthalpyKjPerKg).toBeGreaterThan(2675.53);
  });

  it("rejects saturation pressures below the line's start at 0 °C", () => {
    // The brief's 0.006 bar a lies below p_s(0 °C) = 0.00611213 bar a.
    expect(METER_RANGE.minPressureBarAbs).toBe(0.006);
    expect(() => saturationTemperatureC(0.006)).toThrow(/0\.00611213 bar a/);
  });

  it("rejects saturation temperatures whose pressure leaves the meter range", () => {
    expect(() => saturationPressureBarAbs(250)).not.toThrow();
    expect(() => saturationPressureBarAbs(251)).toThrow(PhysicsRangeError);
  });

  it("rejects non-finite input", () => {
    expect(() => liquidWater(Number.NaN, 20)).toThrow(/finite/);
    expect(() => liquidWater(2, Infinity)).toThrow(/finite/);
  });
});
