// The heat meter's short path (region1LiquidPairInRange over the generated,
// unrolled sums; liquidWaterPair's single saturation check) against the
// general one (region1Properties; liquidWater state by state): the same
// numbers to the last bit, and the same error, field and message, for every
// input. The general path is itself held to the release's term-by-term
// formulation (if97-fast.test.ts) and verification tables (if97.test.ts).

import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  liquidPairRecord,
  region1LiquidPairInRange,
  region1Properties,
  saturationPressureMpa,
} from "./if97";
import { liquidWater, liquidWaterPair } from "./water-properties";

// A liquid state anywhere in region 1: T, and p from p_s(T) to 100 MPa.
const region1State = fc
  .tuple(
    fc.double({ min: 273.15, max: 623.15, noNaN: true }),
    fc.double({ min: 0, max: 1, noNaN: true }),
  )
  .map(([tK, share]) => {
    const ps = saturationPressureMpa(tK);
    return { tK, pMpa: ps + share * (100 - ps) };
  });

function outcome(run: () => void): string {
  try {
    run();
    return "ok";
  } catch (e) {
    const err = e as Error & { field?: string };
    return `${err.name} ${err.field}: ${err.message}`;
  }
}

describe("region 1 pair for heat meters", () => {
  it("gives region1Properties' density, enthalpy and entropy bit for bit", () => {
    fc.assert(
      fc.property(
        region1State,
        fc.double({ min: 273.15, max: 623.15, noNaN: true }),
        ({ tK, pMpa }, otherK) => {
          // Both states at one pressure: the second only where it is liquid.
          fc.pre(pMpa >= saturationPressureMpa(otherK));
          const pair = liquidPairRecord();
          region1LiquidPairInRange(pMpa, tK, otherK, pair);
          const first = region1Properties(pMpa, tK);
          const second = region1Properties(pMpa, otherK);
          expect(pair).toEqual({
            firstDensityKgPerM3: first.densityKgPerM3,
            firstEnthalpyKjPerKg: first.enthalpyKjPerKg,
            firstEntropyKjPerKgK: first.entropyKjPerKgK,
            secondDensityKgPerM3: second.densityKgPerM3,
            secondEnthalpyKjPerKg: second.enthalpyKjPerKg,
            secondEntropyKjPerKgK: second.entropyKjPerKgK,
          });
        },
      ),
      { numRuns: 2000 },
    );
  });

  it("accepts and refuses exactly what liquidWater does, with the same error", () => {
    // Inside and outside the meter range (0-250 °C, 0.006-40 bar a), near
    // and past the saturation line, and numbers that are not numbers.
    const temperature = fc.oneof(
      fc.double({ min: -5, max: 260, noNaN: true }),
      fc.constantFrom(0, 250, 99.6, 100, 120.2, 212.4, NaN, Infinity),
    );
    const pressure = fc.oneof(
      fc.double({ min: 0, max: 45, noNaN: true }),
      fc.constantFrom(0.006, 1, 1.01325, 2, 20, 40, NaN, -Infinity),
    );
    fc.assert(
      fc.property(pressure, temperature, temperature, (p, flow, ret) => {
        const pair = liquidPairRecord();
        const fields = { first: "flowTempC", second: "returnTempC" };
        const short = outcome(() =>
          liquidWaterPair(p, flow, ret, fields, pair),
        );
        const general = outcome(() => {
          liquidWater(p, flow, { temperature: "flowTempC" });
          liquidWater(p, ret, { temperature: "returnTempC" });
        });
        expect(short).toBe(general);
        if (general === "ok") {
          const f = liquidWater(p, flow);
          const r = liquidWater(p, ret);
          expect([
            pair.firstEnthalpyKjPerKg,
            pair.secondDensityKgPerM3,
          ]).toEqual([f.enthalpyKjPerKg, r.densityKgPerM3]);
        }
      }),
      { numRuns: 4000 },
    );
  });

  it("checks the phase of both states at the saturation line", () => {
    // 2 bar a boils at 120.21 °C [IF97 Eq. 31; steam tables, memory]:
    // a cool flow and a return past boiling is refused for the return.
    const pair = liquidPairRecord();
    const fields = { first: "flowTempC", second: "returnTempC" };
    expect(() => liquidWaterPair(2, 60, 125, fields, pair)).toThrow(
      /returnTempC: 125 °C is not liquid at 2 bar a/,
    );
    expect(() => liquidWaterPair(2, 125, 60, fields, pair)).toThrow(
      /flowTempC: 125 °C is not liquid at 2 bar a/,
    );
    liquidWaterPair(2, 120, 60, fields, pair);
    expect(pair.firstEnthalpyKjPerKg).toBeGreaterThan(
      pair.secondEnthalpyKjPerKg,
    );
  });
});
