// Exergy of a water flow, checked three ways:
// 1. against python3-iapws 1.5.2 (Debian's python3-iapws 1.5.3-1), an
//    independent IF97 implementation, the same library references.md uses for
//    its [computed] values. No npm package for water properties could be
//    found (the registry has no iapws, xsteam or coolprop package), so the
//    reference figures were computed once with it and are pinned here:
//      from iapws.iapws97 import _Region1
//      f, r = _Region1(T_f, p), _Region1(T_r, p)
//      1000 * ((f["h"] - r["h"]) - T0 * (f["s"] - r["s"])) / 3600
// 2. against the constant-c closed form m·c·[(T₁ − T₂) − T₀·ln(T₁/T₂)]
//    (references.md §9 [computed]), within a tolerance justified below;
// 3. by sign: positive for heating and for chilled water, refused for an
//    ambient on the wrong side of the flow.
// IF97's entropy itself is verified against Table 5 in if97.test.ts; the
// first test below repeats one row through the meter-facing path.

import { describe, expect, it } from "vitest";
import { PhysicsError } from "./errors";
import { AMBIENT_RANGE_C, waterExergyKj } from "./water-exergy";
import { waterHeat } from "./water-heat";
import { liquidWater } from "./water-properties";
import { expectRelativeClose } from "./test-helpers";

const KJ_PER_KWH = 3600;

// Exergy of `massKg` of water between flow and return at one pressure, kWh.
function exergyKwh(
  massKg: number,
  flowTempC: number,
  returnTempC: number,
  pressureBarAbs: number,
  ambientTempC: number,
) {
  const f = liquidWater(pressureBarAbs, flowTempC);
  const r = liquidWater(pressureBarAbs, returnTempC);
  const kj = waterExergyKj({
    massKg,
    flowTempC,
    returnTempC,
    flowEnthalpyKjPerKg: f.enthalpyKjPerKg,
    returnEnthalpyKjPerKg: r.enthalpyKjPerKg,
    flowEntropyKjPerKgK: f.entropyKjPerKgK,
    returnEntropyKjPerKgK: r.entropyKjPerKgK,
    ambientTempC,
  });
  const heatKwh =
    (massKg * (f.enthalpyKjPerKg - r.enthalpyKjPerKg)) / KJ_PER_KWH;
  return { exergy: kj / KJ_PER_KWH, heat: heatKwh, f, r };
}

function reasonOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof PhysicsError) return e.message;
    throw e;
  }
  throw new Error("expected a PhysicsError");
}

it("takes IF97 entropy through the meter path: s(300 K, 3 MPa) = 0.392294792 kJ/(kg·K) (Table 5)", () => {
  expectRelativeClose(
    liquidWater(30, 26.85).entropyKjPerKgK,
    0.392294792,
    1e-8,
  );
});

describe("against python3-iapws (1000 kg of water)", () => {
  // Exergy is a difference of nearly equal terms (Δh and T₀·Δs), so the two
  // implementations' 1e-9 agreement in h and s can grow about twentyfold in
  // the chilled cases (Ex/Δh ≈ 0.05); 1e-7 relative leaves room for that.
  it.each([
    // flow, return, bar a, ambient, exergy kWh [computed, python3-iapws]
    [75, 50, 16, 5, 4.963370272],
    [90, 70, 6, -5, 5.604728499],
    [45, 30, 3, 10, 1.538104957],
    [7, 12, 16, 25, 0.3193529713],
    [6, 12, 4, 30, 0.5208293574],
  ])(
    "%s/%s °C at %s bar a, ambient %s °C: %s kWh",
    (tf, tr, p, t0, expected) => {
      expectRelativeClose(
        exergyKwh(1000, tf, tr, p, t0).exergy,
        expected,
        1e-7,
      );
    },
  );
});

describe("against the constant-c closed form", () => {
  // With c the interval's mean c_p (Δh/ΔT from IF97) the energy terms are
  // equal by construction and only ∫c·dT/T against c·ln(T₁/T₂) differs: a
  // second-order effect of c_p's variation across the interval (under 1 % in
  // 0-100 °C), about 1e-4 of the exergy here [computed]. 5e-4 allows that
  // and still catches a T₀ in °C instead of K (a 20-fold error) or a
  // dropped term.
  // With the trade's c = 4.18 kJ/(kg·K) (common practice) the error is the
  // spread of c_p itself, 4.178-4.21 in this range (references.md §2): 1 %.
  it.each([
    [75, 50, 16, 5],
    [90, 70, 6, -5],
    [45, 30, 3, 10],
    [7, 12, 16, 25],
    [10, 15, 6, 32],
  ])("%s/%s °C at %s bar a, ambient %s °C", (tf, tr, p, t0) => {
    const { exergy, heat } = exergyKwh(1000, tf, tr, p, t0);
    const [t1, t2, tAmb] = [tf + 273.15, tr + 273.15, t0 + 273.15];
    const closed = (c: number) =>
      (1000 * c * (t1 - t2 - tAmb * Math.log(t1 / t2))) / KJ_PER_KWH;
    const meanC = (heat * KJ_PER_KWH) / 1000 / (tf - tr);
    expectRelativeClose(exergy, closed(meanC), 5e-4);
    expectRelativeClose(exergy, closed(4.18), 1e-2);
  });
});

describe("sign: positive when exergy enters the site", () => {
  it("is positive for a heating flow, with the heat positive too", () => {
    const r = exergyKwh(500, 80, 55, 5, 8);
    expect(r.heat).toBeGreaterThan(0);
    expect(r.exergy).toBeGreaterThan(0);
    expect(r.exergy).toBeLessThan(r.heat);
  });

  it("is positive for chilled water although the heat is negative", () => {
    const r = exergyKwh(500, 6, 12, 5, 28);
    expect(r.heat).toBeLessThan(0);
    expect(r.exergy).toBeGreaterThan(0);
    expect(r.exergy).toBeLessThan(-r.heat);
  });

  it("shrinks as the ambient nears the flow, and keeps a smaller figure with the ambient between return and flow", () => {
    // A 45/30 °C low-temperature circuit on days of 0, 20 and 35 °C.
    const cold = exergyKwh(500, 45, 30, 5, 0).exergy;
    const mild = exergyKwh(500, 45, 30, 5, 20).exergy;
    const between = exergyKwh(500, 45, 30, 5, 35).exergy;
    expect(cold).toBeGreaterThan(mild);
    expect(mild).toBeGreaterThan(between);
    expect(between).toBeGreaterThan(0);
  });

  it("is zero with no flow", () => {
    expect(exergyKwh(0, 80, 55, 5, 10).exergy).toBe(0);
  });
});

describe("ambient refusals name the field and the range", () => {
  it("refuses an ambient at or above the flow of a heating flow", () => {
    expect(reasonOf(() => exergyKwh(1, 40, 30, 3, 40))).toContain(
      "ambientTempC: 40 °C is not below the flow temperature 40 °C",
    );
    expect(reasonOf(() => exergyKwh(1, 40, 30, 3, 45))).toContain(
      "-50 °C to under 40 °C",
    );
  });

  it("refuses an ambient at or below the flow of a chilled flow (e.g. flow and return swapped)", () => {
    // 50 °C flow, 75 °C return on a 5 °C day: read as chilled water, the
    // ambient is below the flow, which is what swapped sensors look like.
    expect(reasonOf(() => exergyKwh(1, 50, 75, 16, 5))).toContain(
      "ambientTempC: 5 °C is not above the flow temperature 50 °C",
    );
  });

  it.each([AMBIENT_RANGE_C.min - 1, AMBIENT_RANGE_C.max + 1])(
    "refuses an ambient of %s °C, outside -50 °C to 50 °C",
    (t0) => {
      expect(reasonOf(() => exergyKwh(1, 70, 50, 3, t0))).toContain(
        `ambientTempC: ${t0} °C is outside -50 °C to 50 °C`,
      );
    },
  );

  it("accepts any ambient in range when flow and return are equal (no heat, no exergy)", () => {
    expect(exergyKwh(10, 40, 40, 3, 45).exergy).toBe(0);
  });
});

it("waterHeat returns the entropies the exergy needs", () => {
  const r = waterHeat({
    volumeM3: 1,
    flowTempC: 75,
    returnTempC: 50,
    pressureBarAbs: 16,
    sensorAt: "return",
  });
  expect(r.flowEntropyKjPerKgK).toBe(liquidWater(16, 75).entropyKjPerKgK);
  expect(r.returnEntropyKjPerKgK).toBe(liquidWater(16, 50).entropyKjPerKgK);
});
