// Carnot limits and the exergy of heat, against the textbook forms of
// references.md §9 worked by hand.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  carnotCoolingCop,
  carnotHeatingCop,
  heatExergyKwh,
  meanTemperatureK,
} from "./carnot";

describe("Carnot COP [textbook; references.md §9]", () => {
  it("heating from 0 °C to 35 °C: 308.15 / 35 = 8.804", () => {
    expect(carnotHeatingCop(35, 0)).toBeCloseTo(308.15 / 35, 12);
  });

  it("cooling at 7 °C rejecting at 35 °C: 280.15 / 28 = 10.005", () => {
    expect(carnotCoolingCop(7, 35)).toBeCloseTo(280.15 / 28, 12);
  });

  it("sets no limit when heat would flow by itself", () => {
    expect(carnotHeatingCop(10, 12)).toBe(Infinity);
    expect(carnotCoolingCop(12, 5)).toBe(Infinity);
  });
});

describe("exergy of heat carried by water", () => {
  it("equals the constant-c closed form m·c·[(T₁ − T₂) − T₀·ln(T₁/T₂)] (references.md §9)", () => {
    // 1000 kg cooled from 70 °C to 40 °C, c = 4.18 kJ/(kg·K) (common
    // practice), dead state 10 °C.
    const m = 1000;
    const c = 4.18;
    const [t1, t2, t0] = [343.15, 313.15, 283.15];
    const heatKwh = (m * c * (t1 - t2)) / 3600;
    const closedForm = (m * c * (t1 - t2 - t0 * Math.log(t1 / t2))) / 3600;
    expect(heatExergyKwh(heatKwh, 70, 40, 10)).toBeCloseTo(closedForm, 9);
  });

  it("is positive for cooling delivered too: cold below the dead state has work value", () => {
    const exergy = heatExergyKwh(100, 6, 12, 25);
    expect(exergy).toBeGreaterThan(0);
    expect(exergy).toBeLessThan(100);
  });

  it("is nil at the dead state and below the heat itself everywhere", () => {
    expect(heatExergyKwh(100, 20, 20, 20)).toBeCloseTo(0, 12);
    fc.assert(
      fc.property(
        fc.double({ min: 30, max: 120, noNaN: true }),
        fc.double({ min: 1, max: 25, noNaN: true }),
        fc.double({ min: -20, max: 25, noNaN: true }),
        (flow, drop, ambient) =>
          heatExergyKwh(100, flow, flow - drop, ambient) < 100,
      ),
    );
  });

  it("takes the mean temperature between flow and return", () => {
    const tm = meanTemperatureK(70, 40);
    expect(tm).toBeGreaterThan(313.15);
    expect(tm).toBeLessThan(343.15);
  });
});
