// Property-based tests of the physics core: invariants that must hold for
// every input in range, not only at the worked values of references.md.
// fast-check draws the inputs; numRuns stays at 200 per property so the unit
// suite stays fast. A failing run prints the seed and the shrunk input.

import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { differenceRegister, ROLLOVER_MAX_FRACTION } from "./electric";
import { evaluateItem } from "./evaluate";
import {
  IF97_SATURATION_MIN_PRESSURE_MPA,
  region1Properties,
  saturationPressureMpa,
  saturationTemperatureK,
} from "./if97";
import { sensibleHeatKj } from "./sensible-heat";
import { heatMeterMpePercent } from "./uncertainty";
import type { MeterClass } from "./uncertainty";
import { convertEnergy, ENERGY_UNITS } from "./units";
import type { EnergyUnit } from "./units";
import { waterHeat } from "./water-heat";
import type { SensorPosition } from "./water-heat";
import { METER_RANGE, saturationPressureBarAbs } from "./water-properties";

const RUNS = { numRuns: 200 };

// |a − b| within `tol` of the larger magnitude; true when both are zero.
function expectRelClose(actual: number, expected: number, tol: number): void {
  const scale = Math.max(Math.abs(actual), Math.abs(expected));
  expect(
    Math.abs(actual - expected),
    `got ${actual}, expected ${expected}`,
  ).toBeLessThanOrEqual(tol * scale);
}

const finite = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

const fraction = finite(0, 1);

// 0, or a magnitude from 1e-6 up: fast-check also draws subnormal doubles
// (down to 5e-324), where IEEE arithmetic keeps no relative precision and no
// meter reading lives.
const amount = (max: number) => fc.oneof(fc.constant(0), finite(1e-6, max));
const sensor = fc.constantFrom<SensorPosition>("flow", "return");

// A liquid water state pair within the meter range: flow and return in
// 0-250 °C and a pressure between the saturation pressure of the hotter one
// and 40 bar a, so both temperatures are liquid (IF97 region 1).
const waterCircuit = fc
  .record({
    flowTempC: finite(METER_RANGE.minTemperatureC, METER_RANGE.maxTemperatureC),
    returnTempC: finite(
      METER_RANGE.minTemperatureC,
      METER_RANGE.maxTemperatureC,
    ),
    pressureFraction: fraction,
    volumeM3: amount(1e4),
    sensorAt: sensor,
  })
  .map(({ pressureFraction, ...rest }) => {
    const hotter = Math.max(rest.flowTempC, rest.returnTempC);
    const minBar = Math.max(
      saturationPressureBarAbs(hotter),
      METER_RANGE.minPressureBarAbs,
    );
    const maxBar = METER_RANGE.maxPressureBarAbs;
    return {
      ...rest,
      pressureBarAbs: minBar + pressureFraction * (maxBar - minBar),
    };
  });

const other = (s: SensorPosition): SensorPosition =>
  s === "flow" ? "return" : "flow";

describe("water heat, Q = V·ρ(T_sensor, p)·(h(T_flow, p) − h(T_return, p))", () => {
  // Swapping the two temperatures alone is NOT antisymmetric: with the sensor
  // label kept (say sensor_at = flow), the sensor now sits in water at the
  // other temperature, so ρ changes and |Q| changes by ρ(T_r)/ρ(T_f) (1.35 %
  // at 75/50 °C, references.md §3). The invariant that holds swaps the
  // sensor position with the temperatures, which keeps the sensor's
  // temperature, hence ρ and the mass, the same: then only the sign of
  // Δh flips. In IEEE arithmetic a − b is exactly −(b − a), so the two
  // energies are exact negatives; the tolerance is there only as a guard.
  it("swapping flow and return (and with them the sensor's pipe) flips the sign", () => {
    fc.assert(
      fc.property(waterCircuit, (c) => {
        const q = waterHeat(c).energyKj;
        const swapped = waterHeat({
          ...c,
          flowTempC: c.returnTempC,
          returnTempC: c.flowTempC,
          sensorAt: other(c.sensorAt),
        }).energyKj;
        expect(Math.abs(q + swapped)).toBeLessThanOrEqual(1e-12 * Math.abs(q));
        if (q !== 0) expect(Math.sign(swapped)).toBe(-Math.sign(q));
      }),
      RUNS,
    );
  });

  it("swapping the temperatures with the sensor label kept scales |Q| by the density ratio", () => {
    fc.assert(
      fc.property(waterCircuit, (c) => {
        const q = waterHeat(c);
        const swapped = waterHeat({
          ...c,
          flowTempC: c.returnTempC,
          returnTempC: c.flowTempC,
        });
        // Same magnitude of Δh, opposite sign; the mass comes from the
        // density at the new sensor temperature.
        const rhoRatio =
          swapped.densityAtSensorKgPerM3 / q.densityAtSensorKgPerM3;
        expectRelClose(swapped.energyKj, -q.energyKj * rhoRatio, 1e-12);
      }),
      RUNS,
    );
  });

  it("the same swap through the API item flips the sign of energy_kwh", () => {
    fc.assert(
      fc.property(waterCircuit, (c) => {
        const item = {
          quantity: "water_heat",
          volume_m3: c.volumeM3,
          flow_temp_c: c.flowTempC,
          return_temp_c: c.returnTempC,
          pressure_bar_abs: c.pressureBarAbs,
          sensor_at: c.sensorAt,
        };
        const a = evaluateItem(item);
        const b = evaluateItem({
          ...item,
          flow_temp_c: c.returnTempC,
          return_temp_c: c.flowTempC,
          sensor_at: other(c.sensorAt),
        });
        if (!a.ok || !b.ok) throw new Error("expected both items to evaluate");
        expect(Math.abs(a.energy_kwh + b.energy_kwh)).toBeLessThanOrEqual(
          1e-12 * Math.abs(a.energy_kwh),
        );
      }),
      RUNS,
    );
  });

  it("Q is linear in V: Q(a·V) = a·Q(V) and Q(V₁ + V₂) = Q(V₁) + Q(V₂)", () => {
    fc.assert(
      fc.property(waterCircuit, amount(1e3), amount(1e4), (c, a, v2) => {
        const q = (volumeM3: number) => waterHeat({ ...c, volumeM3 }).energyKj;
        expectRelClose(q(a * c.volumeM3), a * q(c.volumeM3), 1e-12);
        const sum = q(c.volumeM3) + q(v2);
        const scale = Math.abs(q(c.volumeM3)) + Math.abs(q(v2));
        expect(Math.abs(q(c.volumeM3 + v2) - sum)).toBeLessThanOrEqual(
          1e-12 * scale,
        );
      }),
      RUNS,
    );
  });

  it("no volume, no heat: Q(0) = 0", () => {
    fc.assert(
      fc.property(waterCircuit, (c) => {
        // ±0: 0 × a negative Δh is −0 in IEEE arithmetic, still no heat.
        expect(Math.abs(waterHeat({ ...c, volumeM3: 0 }).energyKj)).toBe(0);
      }),
      RUNS,
    );
  });

  it("ΔT = 0 gives exactly 0 (and no k factor)", () => {
    fc.assert(
      fc.property(waterCircuit, (c) => {
        const r = waterHeat({ ...c, returnTempC: c.flowTempC });
        // h(T, p) − h(T, p) is exactly +0 and V·ρ ≥ 0, so the product is +0.
        expect(r.energyKj).toBe(0);
        expect(r.kFactorKwhPerM3K).toBeNull();
      }),
      RUNS,
    );
  });

  it("heating (flow hotter than return) is positive, chilled water negative", () => {
    fc.assert(
      fc.property(waterCircuit, (c) => {
        // A Δθ below 1 µK is no measurement; h cannot resolve it either.
        fc.pre(c.volumeM3 > 0 && Math.abs(c.flowTempC - c.returnTempC) >= 1e-6);
        const q = waterHeat(c).energyKj;
        expect(Math.sign(q)).toBe(Math.sign(c.flowTempC - c.returnTempC));
      }),
      RUNS,
    );
  });
});

describe("IF97 region 1 enthalpy", () => {
  // c_p = (∂h/∂T)_p > 0 everywhere in the liquid, so h rises with T at fixed
  // p. Region 1 (IF97 §5.1): 273.15 K ≤ T ≤ 623.15 K and p_s(T) ≤ p ≤ 100 MPa;
  // at p below p_s(623.15 K) the liquid ends at T_s(p). Temperatures closer
  // than 1e-6 K are skipped: a difference of c_p·ΔT below one unit in the
  // last place of h cannot show up in double precision.
  const T_MIN_K = 273.15;
  const T_REGION1_MAX_K = 623.15;
  const psMaxMpa = saturationPressureMpa(T_REGION1_MAX_K);

  it("h(T, p) increases with T at fixed p across the liquid range", () => {
    fc.assert(
      fc.property(
        finite(IF97_SATURATION_MIN_PRESSURE_MPA, 100),
        fraction,
        fraction,
        (pMpa, f1, f2) => {
          const tMaxK =
            pMpa < psMaxMpa ? saturationTemperatureK(pMpa) : T_REGION1_MAX_K;
          const [lo, hi] = [Math.min(f1, f2), Math.max(f1, f2)];
          const t1 = T_MIN_K + lo * (tMaxK - T_MIN_K);
          const t2 = T_MIN_K + hi * (tMaxK - T_MIN_K);
          fc.pre(t2 - t1 >= 1e-6);
          const h1 = region1Properties(pMpa, t1).enthalpyKjPerKg;
          const h2 = region1Properties(pMpa, t2).enthalpyKjPerKg;
          expect(h2).toBeGreaterThan(h1);
        },
      ),
      RUNS,
    );
  });
});

describe("cumulative registers: difference, multiplier and roll-over", () => {
  const capacity = finite(1, 1e9);
  const multiplier = finite(1e-3, 1e4);

  // Two reads below the capacity, the end one lower: a drop.
  const drop = fc
    .record({ cap: capacity, a: fraction, b: fraction, m: multiplier })
    .map(({ cap, a, b, m }) => ({
      cap,
      start: Math.max(a, b) * cap,
      end: Math.min(a, b) * cap,
      m,
    }))
    .filter(({ cap, start, end }) => end < start && start < cap);

  it("a wrap (start near the top, end just past zero) is capacity − start + end, times the multiplier", () => {
    // start in the top half, end below start − cap/2: the wrapped advance
    // cap − start + end is under half the span, the rule of electric.ts.
    const wrap = fc
      .record({ cap: capacity, s: fraction, e: fraction, m: multiplier })
      .map(({ cap, s, e, m }) => {
        const start = cap * (0.5 + 0.5 * s);
        return { cap, start, end: e * (start - 0.5 * cap), m };
      })
      .filter(
        ({ cap, start, end }) =>
          start < cap && end < start && cap - start + end < 0.5 * cap,
      );
    fc.assert(
      fc.property(wrap, ({ cap, start, end, m }) => {
        const r = differenceRegister({
          startKwh: start,
          endKwh: end,
          multiplier: m,
          capacityKwh: cap,
        });
        if (!r.ok) throw new Error(`expected a roll-over, got: ${r.reason}`);
        expect(r.kind).toBe("rollover");
        expect(r.registerDeltaKwh).toBe(cap - start + end);
        expect(r.energyKwh).toBe((cap - start + end) * m);
        expect(r.energyKwh).toBeGreaterThanOrEqual(0);
      }),
      RUNS,
    );
  });

  it("any drop is a roll-over exactly when the wrapped advance is under half the span, else flagged", () => {
    fc.assert(
      fc.property(drop, ({ cap, start, end, m }) => {
        const r = differenceRegister({
          startKwh: start,
          endKwh: end,
          multiplier: m,
          capacityKwh: cap,
        });
        const wrapped = cap - start + end;
        if (wrapped < ROLLOVER_MAX_FRACTION * cap) {
          if (!r.ok) throw new Error(`expected a roll-over, got: ${r.reason}`);
          expect(r.energyKwh).toBe(wrapped * m);
          expect(r.energyKwh).toBeGreaterThanOrEqual(0);
        } else {
          expect(r).toMatchObject({ ok: false, kind: "register_drop" });
        }
      }),
      RUNS,
    );
  });

  it("a drop with no known roll-over point is always flagged, never a negative energy", () => {
    fc.assert(
      fc.property(drop, ({ start, end, m }) => {
        const r = differenceRegister({
          startKwh: start,
          endKwh: end,
          multiplier: m,
        });
        expect(r).toMatchObject({ ok: false, kind: "register_drop" });
      }),
      RUNS,
    );
  });

  it("an advance is (end − start) × multiplier, never negative", () => {
    fc.assert(
      fc.property(
        capacity,
        fraction,
        fraction,
        multiplier,
        fc.boolean(),
        (cap, a, b, m, withCapacity) => {
          const start = Math.min(a, b) * cap;
          const end = Math.max(a, b) * cap;
          fc.pre(end < cap);
          const r = differenceRegister({
            startKwh: start,
            endKwh: end,
            multiplier: m,
            capacityKwh: withCapacity ? cap : undefined,
          });
          if (!r.ok) throw new Error(`expected an advance, got: ${r.reason}`);
          expect(r.kind).toBe("advance");
          expect(r.energyKwh).toBe((end - start) * m);
          expect(r.energyKwh).toBeGreaterThanOrEqual(0);
        },
      ),
      RUNS,
    );
  });
});

describe("sensible heat, Q = m·c·(T_in − T_out)", () => {
  it("is antisymmetric in inlet and outlet", () => {
    fc.assert(
      fc.property(
        finite(0, 1e6),
        finite(0.1, 10),
        finite(-273.15, 1000),
        finite(-273.15, 1000),
        (m, c, tIn, tOut) => {
          const input = { massKg: m, specificHeatKjPerKgK: c };
          const q = sensibleHeatKj({
            ...input,
            inletTempC: tIn,
            outletTempC: tOut,
          });
          const swapped = sensibleHeatKj({
            ...input,
            inletTempC: tOut,
            outletTempC: tIn,
          });
          // Exact in IEEE arithmetic (a − b = −(b − a)); abs() folds −0.
          expect(Math.abs(q + swapped)).toBe(0);
        },
      ),
      RUNS,
    );
  });

  it("equal inlet and outlet give exactly 0", () => {
    fc.assert(
      fc.property(
        finite(0, 1e6),
        finite(0.1, 10),
        finite(-273.15, 1000),
        (m, c, t) => {
          const q = sensibleHeatKj({
            massKg: m,
            specificHeatKjPerKgK: c,
            inletTempC: t,
            outletTempC: t,
          });
          expect(q).toBe(0);
        },
      ),
      RUNS,
    );
  });
});

describe("energy unit conversions", () => {
  const units = Object.keys(ENERGY_UNITS) as EnergyUnit[];
  const unit = fc.constantFrom(...units);
  // Magnitudes from 1e-6 to 1e12 of either sign; subnormals are left out,
  // where relative precision is lost by design of IEEE doubles.
  const value = fc
    .tuple(finite(1e-6, 1e12), fc.boolean())
    .map(([x, negative]) => (negative ? -x : x));

  it("round-trip: from → to → from returns the value", () => {
    fc.assert(
      fc.property(value, unit, unit, (x, from, to) => {
        const back = convertEnergy(convertEnergy(x, from, to), to, from);
        expectRelClose(back, x, 1e-14);
      }),
      RUNS,
    );
  });

  it("chains: from → via → to equals from → to", () => {
    fc.assert(
      fc.property(value, unit, unit, unit, (x, from, via, to) => {
        const chained = convertEnergy(convertEnergy(x, from, via), via, to);
        expectRelClose(chained, convertEnergy(x, from, to), 1e-14);
      }),
      RUNS,
    );
  });

  it("1 kWh is 3.6 MJ for any amount (NIST SP 811 App. B.8, exact)", () => {
    fc.assert(
      fc.property(value, (x) => {
        expectRelClose(convertEnergy(x, "kWh", "MJ"), 3.6 * x, 1e-15);
      }),
      RUNS,
    );
  });
});

describe("EN 1434 maximum permissible error", () => {
  // E = E_f + (0.5 + 3·Δθmin/Δθ) + (0.5 + Δθmin/Δθ): only the temperature
  // terms depend on Δθ, and they fall as Δθ grows (references.md §3).
  it("decreases as Δθ grows, all else equal", () => {
    fc.assert(
      fc.property(
        fc.constantFrom<MeterClass>(1, 2, 3),
        fc.constantFrom(3, 5, 10),
        finite(0, 200),
        finite(1e-6, 10),
        finite(0.6, 1000),
        finite(0.01, 1),
        (meterClass, dThetaMin, extra, growth, qp, qOverQp) => {
          const dTheta1 = dThetaMin + extra;
          const dTheta2 = dTheta1 * (1 + growth);
          const common = {
            meterClass,
            deltaThetaMinK: dThetaMin,
            qpM3PerH: qp,
            flowM3PerH: qp * qOverQp,
          };
          const e1 = heatMeterMpePercent({ ...common, deltaThetaK: dTheta1 });
          const e2 = heatMeterMpePercent({ ...common, deltaThetaK: dTheta2 });
          expect(e2.totalPercent).toBeLessThan(e1.totalPercent);
          expect(e2.flowSensorPercent).toBe(e1.flowSensorPercent);
        },
      ),
      RUNS,
    );
  });
});
