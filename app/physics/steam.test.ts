// Condensing-steam energy and the phase-rule check. Values from
// references.md §2 and §8, [computed, IF97] there unless said otherwise.

import { describe, expect, it } from "vitest";
import { PhysicsInputError, PhysicsRangeError } from "./errors";
import fc from "fast-check";
import {
  PHASE_RULE_TOLERANCE_K,
  resolveSaturatedSteam,
  steamHeat,
} from "./steam";
import {
  METER_RANGE,
  SATURATION_RANGE,
  saturationTemperatureC,
} from "./water-properties";

describe("steam heat Q = m·(h″ − h_condensate)", () => {
  it("1000 kg of 7 bar g steam condensed to saturated water: 2047 MJ = 568.6 kWh", () => {
    // references.md §8 [computed, IF97]; gauge + 1.01325 bar (common practice).
    const q = steamHeat({ massKg: 1000, pressureBarG: 7 });
    expect(q.energyKj / 1000).toBeCloseTo(2047.05, 2);
    expect(q.energyKj / 3600).toBeCloseTo(568.6, 1);
    expect(q.condensate).toBe("saturated_liquid");
    expect(q.pressureBarAbs).toBeCloseTo(8.01325, 10);
  });

  it("reproduces h_fg at the gauge pressures of references.md §2", () => {
    const rows = [
      { g: 0, hfg: 2256.54 },
      { g: 3, hfg: 2132.97 },
      { g: 7, hfg: 2047.05 },
      { g: 10, hfg: 1999.28 },
    ];
    for (const { g, hfg } of rows) {
      const q = steamHeat({ massKg: 1, pressureBarG: g });
      expect(q.latentHeatKjPerKg).toBeCloseTo(hfg, 2);
      expect(q.energyKj).toBeCloseTo(hfg, 2);
    }
  });

  it("converting gauge with 1.0 bar instead of 1.01325 bar would give 2047.29", () => {
    // references.md §2 pitfalls [computed]: 2047.29 kJ/kg. This IF97 code gives
    // 2047.2846 (0.0054 kJ/kg, 2.6e-6 relative, away; it would print as
    // 2047.28), so the check allows one unit of the printed last digit.
    const q = steamHeat({ massKg: 1, pressureBarAbs: 8 });
    expect(Math.abs(q.latentHeatKjPerKg - 2047.29)).toBeLessThan(0.01);
    expect(q.latentHeatKjPerKg).toBeGreaterThan(2047.05);
  });

  it("counts the sensible heat of subcooled condensate on top of h_fg", () => {
    const sat = steamHeat({ massKg: 180, pressureBarG: 7 });
    const sub = steamHeat({
      massKg: 180,
      pressureBarG: 7,
      condensateTempC: 95,
    });
    expect(sub.condensate).toBe("subcooled_liquid");
    // 170.48 → 95 °C at c ≈ 4.2 kJ/(kg·K) (common practice) is ≈ 317 kJ/kg.
    const extraPerKg = (sub.energyKj - sat.energyKj) / 180;
    expect(extraPerKg).toBeGreaterThan(300);
    expect(extraPerKg).toBeLessThan(335);
  });

  it("works from a saturation temperature alone: 100 °C gives 2256.47 kJ/kg", () => {
    // references.md §2 [computed, IF97] h_fg at 100 °C.
    const q = steamHeat({ massKg: 1, saturationTempC: 100 });
    expect(q.energyKj).toBeCloseTo(2256.47, 2);
    expect(q.pressureBarAbs).toBeCloseTo(1.01418, 5);
  });
});

describe("Gibbs phase rule: one degree of freedom", () => {
  it("accepts a pressure and a saturation temperature that agree", () => {
    const s = resolveSaturatedSteam({
      pressureBarG: 7,
      saturationTempC: 170.5,
    });
    expect(s.source).toBe("pressureBarG");
    expect(s.saturationTempC).toBeCloseTo(170.482, 3);
  });

  it("rejects 7 bar g with the 164.95 °C of 7 bar a (a gauge/absolute mix-up)", () => {
    // references.md §2 pitfalls [computed]: 7 bar a saturates at 164.95 °C.
    const bad = () =>
      steamHeat({ massKg: 1, pressureBarG: 7, saturationTempC: 164.95 });
    expect(bad).toThrow(PhysicsRangeError);
    expect(bad).toThrow(/saturationTempC: .*phase rule.*within 1 K/);
  });

  it("rejects absolute and gauge pressures that disagree", () => {
    expect(() =>
      resolveSaturatedSteam({ pressureBarAbs: 7, pressureBarG: 7 }),
    ).toThrow(/pressureBarG/);
    expect(() =>
      resolveSaturatedSteam({ pressureBarAbs: 8.01325, pressureBarG: 7 }),
    ).not.toThrow();
  });

  it("has a tolerance that still catches a gauge/absolute mix-up up to 40 bar a", () => {
    // [computed, IF97] here: T_s(p) − T_s(p − 1.01325 bar) over the meter
    // range is smallest at the top (≈ 1.5 K at 40 bar a), above 1 K.
    let smallest = Infinity;
    for (let p = 1.02; p <= METER_RANGE.maxPressureBarAbs; p += 0.05) {
      const shift =
        saturationTemperatureC(p) - saturationTemperatureC(p - 1.01325);
      smallest = Math.min(smallest, shift);
    }
    expect(smallest).toBeGreaterThan(PHASE_RULE_TOLERANCE_K);
    expect(smallest).toBeCloseTo(1.52, 1);
  });

  it("needs at least one state variable", () => {
    expect(() => steamHeat({ massKg: 1 })).toThrow(PhysicsInputError);
  });
});

describe("condensate checks", () => {
  it("rejects condensate hotter than saturation beyond the tolerance", () => {
    // T_s(8.01325 bar a) = 170.48 °C (references.md §2).
    expect(() =>
      steamHeat({ massKg: 1, pressureBarG: 7, condensateTempC: 175 }),
    ).toThrow(/condensateTempC: .*hotter than the saturation temperature/);
  });

  it("takes condensate within the tolerance above T_s as saturated liquid", () => {
    const q = steamHeat({ massKg: 1, pressureBarG: 7, condensateTempC: 170.9 });
    expect(q.condensate).toBe("at_saturation_within_tolerance");
    expect(q.energyKj).toBeCloseTo(2047.05, 2);
  });

  it("rejects a negative mass and out-of-range pressures", () => {
    expect(() => steamHeat({ massKg: -1, pressureBarG: 7 })).toThrow(/massKg/);
    expect(() => steamHeat({ massKg: 1, pressureBarAbs: 45 })).toThrow(
      /40 bar a/,
    );
  });
});

describe("the steam range is the same whichever field names the state", () => {
  it("derives the saturation-temperature range from the pressure range: T_s(40 bar a) = 250.36 °C", () => {
    // IAPWS-IF97 region 4 (Eq. 31) at 4 MPa [computed]; steam tables print
    // 250.35-250.36 °C at 40 bar [memory]. The code reproduces IF97's
    // verification Table 35 (if97.test.ts), e.g. T_s(1 MPa) = 453.035632 K.
    expect(SATURATION_RANGE.maxTemperatureC).toBeCloseTo(250.3575, 4);
    expect(SATURATION_RANGE.maxPressureBarAbs).toBe(
      METER_RANGE.maxPressureBarAbs,
    );
    expect(SATURATION_RANGE.minTemperatureC).toBe(0);
  });

  it("accepts 40 bar a and the 250.3 °C just below it; refuses both just beyond", () => {
    const byPressure = steamHeat({ massKg: 1, pressureBarAbs: 40 });
    expect(byPressure.saturationTempC).toBeCloseTo(250.3575, 4);
    // 250.3 °C saturates at 39.96 bar a [computed, IF97 Eq. 30].
    const byTemperature = steamHeat({ massKg: 1, saturationTempC: 250.3 });
    expect(byTemperature.pressureBarAbs).toBeCloseTo(39.9612, 4);
    // The top of the range, named either way, is the same state.
    const top = steamHeat({
      massKg: 1,
      saturationTempC: SATURATION_RANGE.maxTemperatureC,
    });
    expect(top.pressureBarAbs).toBeCloseTo(40, 9);
    expect(top.energyKj).toBeCloseTo(byPressure.energyKj, 6);

    expect(() => steamHeat({ massKg: 1, pressureBarAbs: 40.01 })).toThrow(
      /pressureBarAbs: .*40 bar a/,
    );
    expect(() => steamHeat({ massKg: 1, saturationTempC: 250.4 })).toThrow(
      /saturationTempC: 250\.4 °C is outside the saturation range 0 °C to 250\.36 °C/,
    );
    expect(() => steamHeat({ massKg: 1, saturationTempC: -0.5 })).toThrow(
      /saturationTempC: .*saturation range/,
    );
  });

  it("any pressure in range, given as T_s(p) instead, is accepted and gives the same state", () => {
    fc.assert(
      fc.property(
        fc.double({
          min: SATURATION_RANGE.minPressureBarAbs,
          max: SATURATION_RANGE.maxPressureBarAbs,
          noNaN: true,
        }),
        (p) => {
          const t = saturationTemperatureC(p);
          const viaT = resolveSaturatedSteam({ saturationTempC: t });
          expect(viaT.pressureBarAbs / p).toBeCloseTo(1, 8);
        },
      ),
    );
  });
});

describe("condensate at saturation", () => {
  it("condensate exactly at T_s is saturated liquid, not subcooled", () => {
    // T_s(8.01325 bar a) = 170.48 °C; the very number, as a gateway may echo it.
    const ts = saturationTemperatureC(8.01325);
    const q = steamHeat({ massKg: 1, pressureBarG: 7, condensateTempC: ts });
    expect(q.condensate).toBe("saturated_liquid");
    expect(q.energyKj).toBeCloseTo(2047.05, 2);
    // Named by its saturation temperature, the state round-trips through
    // p_s and T_s with a rounding error (180 °C → 180.0000000000005 °C).
    for (const t of [100, 180, 212.5]) {
      const r = steamHeat({
        massKg: 1,
        saturationTempC: t,
        condensateTempC: t,
      });
      expect(r.condensate, `${t} °C`).toBe("saturated_liquid");
    }
  });

  it("a hundredth of a kelvin below T_s is subcooled, above it within 1 K at saturation", () => {
    const ts = saturationTemperatureC(8.01325);
    expect(
      steamHeat({ massKg: 1, pressureBarG: 7, condensateTempC: ts - 0.01 })
        .condensate,
    ).toBe("subcooled_liquid");
    expect(
      steamHeat({ massKg: 1, pressureBarG: 7, condensateTempC: ts + 0.01 })
        .condensate,
    ).toBe("at_saturation_within_tolerance");
  });

  it("follows the steam's range: condensate at 40 bar a may be above 250 °C, up to T_s", () => {
    const atTop = steamHeat({
      massKg: 1,
      pressureBarAbs: 40,
      condensateTempC: SATURATION_RANGE.maxTemperatureC,
    });
    expect(atTop.condensate).toBe("saturated_liquid");
    const sub = steamHeat({
      massKg: 1,
      pressureBarAbs: 40,
      condensateTempC: 250.2,
    });
    expect(sub.condensate).toBe("subcooled_liquid");
    expect(sub.energyKj).toBeGreaterThan(atTop.energyKj);
    expect(() =>
      steamHeat({ massKg: 1, pressureBarAbs: 40, condensateTempC: -1 }),
    ).toThrow(/condensateTempC: -1 °C is outside 0 °C to 250\.36 °C/);
  });
});
