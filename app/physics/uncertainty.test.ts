// EN 1434 / MID MI-004 MPE of a complete heat meter. Worked values from
// references.md §3, [computed from the formulas] there; the formulas carry the
// provenance stated in uncertainty.ts.

import { describe, expect, it } from "vitest";
import { PhysicsInputError, PhysicsRangeError } from "./errors";
import { heatMeterMpePercent, mpeBand } from "./uncertainty";
import type { MeterClass } from "./uncertainty";

function mpe(
  meterClass: MeterClass,
  dTmin: number,
  dT: number,
  qp: number,
  q: number,
) {
  return heatMeterMpePercent({
    meterClass,
    deltaThetaMinK: dTmin,
    deltaThetaK: dT,
    qpM3PerH: qp,
    flowM3PerH: q,
  });
}

describe("EN 1434 MPE, worked values of references.md §3", () => {
  it("class 2, Δθmin 3 K, Δθ 20 K, qp 1.5, q 0.6: ±3.65 % (2.05 + 0.95 + 0.65)", () => {
    const r = mpe(2, 3, 20, 1.5, 0.6);
    expect(r.flowSensorPercent).toBeCloseTo(2.05, 12);
    expect(r.temperaturePairPercent).toBeCloseTo(0.95, 12);
    expect(r.calculatorPercent).toBeCloseTo(0.65, 12);
    expect(r.totalPercent).toBeCloseTo(3.65, 12);
  });

  it("class 1 at the same point: ±2.625 %", () => {
    expect(mpe(1, 3, 20, 1.5, 0.6).totalPercent).toBeCloseTo(2.625, 12);
  });

  it("class 3 at the same point: ±4.725 %", () => {
    expect(mpe(3, 3, 20, 1.5, 0.6).totalPercent).toBeCloseTo(4.725, 12);
  });

  it("class 2 at Δθ = Δθmin and q = qp/100: ±9.0 %", () => {
    expect(mpe(2, 3, 3, 1.5, 0.015).totalPercent).toBeCloseTo(9.0, 12);
  });

  it("class 2 at Δθ 60 K and q = qp: ±3.22 %", () => {
    expect(mpe(2, 3, 60, 1.5, 1.5).totalPercent).toBeCloseTo(3.22, 12);
  });
});

describe("summed formulas", () => {
  // Class 2: ±(3 + 4·Δθmin/Δθ + 0.02·qp/q) %, whose parts match a supplier's
  // EN 1434-1 data sheet [read, references.md §3]; class 1 ±(2 + 4·Δθmin/Δθ +
  // 0.01·qp/q) and class 3 ±(4 + 4·Δθmin/Δθ + 0.05·qp/q) match a supplier page
  // quoting CJ 128-2007 [read]. Checked where the flow-sensor cap does not bite.
  const points = [
    { dTmin: 3, dT: 5, qp: 2.5, q: 0.1 },
    { dTmin: 5, dT: 40, qp: 10, q: 7 },
    { dTmin: 10, dT: 100, qp: 1.5, q: 0.15 },
  ];
  const summed: Record<MeterClass, (r: number, qr: number) => number> = {
    1: (r, qr) => 2 + 4 * r + 0.01 * qr,
    2: (r, qr) => 3 + 4 * r + 0.02 * qr,
    3: (r, qr) => 4 + 4 * r + 0.05 * qr,
  };
  for (const c of [1, 2, 3] as const) {
    it(`class ${c} equals its summed formula`, () => {
      for (const { dTmin, dT, qp, q } of points) {
        const expected = summed[c](dTmin / dT, qp / q);
        expect(mpe(c, dTmin, dT, qp, q).totalPercent).toBeCloseTo(expected, 12);
      }
    });
  }

  it("caps the class-2 flow sensor at 5 % inside the sum", () => {
    // "(2 + 0.02 qp/q), but not exceeding ±5 %" [read: supplier technical
    // description quoting EN 1434]; MID point 3 sums the capped parts [read].
    const r = mpe(2, 3, 30, 2.5, 2.5 / 250);
    expect(r.flowSensorPercent).toBe(5);
    expect(r.totalPercent).toBeCloseTo(5 + 0.8 + 0.6, 12);
  });

  it("caps the class-1 flow sensor at 3.5 % ([memory], see uncertainty.ts)", () => {
    expect(mpe(1, 3, 30, 2.5, 2.5 / 1000).flowSensorPercent).toBe(3.5);
  });
});

describe("rated operating conditions", () => {
  it("states no MPE below Δθmin", () => {
    expect(() => mpe(2, 3, 2.5, 1.5, 0.6)).toThrow(PhysicsRangeError);
    expect(() => mpe(2, 3, 2.5, 1.5, 0.6)).toThrow(/Δθmin/);
  });

  it("rejects a zero flow, a zero qp and an unknown class", () => {
    expect(() => mpe(2, 3, 20, 1.5, 0)).toThrow(PhysicsInputError);
    expect(() => mpe(2, 3, 20, 0, 1)).toThrow(/qpM3PerH/);
    expect(() => mpe(4 as MeterClass, 3, 20, 1.5, 1)).toThrow(/accuracy class/);
  });
});

describe("mpeBand", () => {
  it("puts a symmetric ± band around a heating energy", () => {
    const b = mpeBand(100, {
      meterClass: 2,
      deltaThetaMinK: 3,
      deltaThetaK: 20,
      qpM3PerH: 1.5,
      flowM3PerH: 0.6,
    });
    expect(b.mpePercent).toBeCloseTo(3.65, 12);
    expect(b.low).toBeCloseTo(96.35, 10);
    expect(b.high).toBeCloseTo(103.65, 10);
  });

  it("keeps low below high for a negative (cooling) energy", () => {
    const b = mpeBand(-100, {
      meterClass: 2,
      deltaThetaMinK: 3,
      deltaThetaK: 20,
      qpM3PerH: 1.5,
      flowM3PerH: 0.6,
    });
    expect(b.plusMinus).toBeCloseTo(3.65, 10);
    expect(b.low).toBeCloseTo(-103.65, 10);
    expect(b.high).toBeCloseTo(-96.35, 10);
  });
});
