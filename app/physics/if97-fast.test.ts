// The region 1 and 2 evaluations take integer powers by repeated
// multiplication and apply each derivative's common factor once. This holds
// them to the formulation written term by term as the release prints it
// (Eqs. 7, 15-17 with Math.pow per term, Tables 3 and 12), over both
// regions' whole validity: the same numbers to 1e-12 relative. Where a
// property passes through zero (h, u and s of liquid water near 0 °C) the
// sums cancel terms of the order of R·T ≈ 126 kJ/kg, and either way of
// summing rounds at about 1e-12 of that: there the bound is 1e-12 of the
// terms' scale (2e-10 in the property's unit), not of the tiny result.

import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  IF97_R_KJ_PER_KG_K as R,
  REGION1,
  REGION2_IDEAL,
  REGION2_RESIDUAL,
  region1Properties,
  region2Properties,
  saturationPressureMpa,
} from "./if97";

const RELATIVE = 1e-12;
const ABSOLUTE = 2e-10;

interface Reference {
  v: number;
  h: number;
  u: number;
  s: number;
  cp: number;
}

function sumTerms(
  terms: ReadonlyArray<readonly [number, number, number]>,
  x: number,
  y: number,
) {
  let g = 0;
  let gX = 0;
  let gY = 0;
  let gYY = 0;
  for (const [i, j, n] of terms) {
    g += n * x ** i * y ** j;
    gX += n * i * x ** (i - 1) * y ** j;
    gY += n * j * x ** i * y ** (j - 1);
    gYY += n * j * (j - 1) * x ** i * y ** (j - 2);
  }
  return { g, gX, gY, gYY };
}

function region1Reference(pMpa: number, tK: number): Reference {
  const pi = pMpa / 16.53;
  const tau = 1386 / tK;
  const t = sumTerms(REGION1, 7.1 - pi, tau - 1.222);
  const gP = -t.gX;
  const rt = R * tK;
  return {
    v: (rt * 1000 * pi * gP) / (pMpa * 1e6),
    h: rt * tau * t.gY,
    u: rt * (tau * t.gY - pi * gP),
    s: R * (tau * t.gY - t.g),
    cp: -R * tau ** 2 * t.gYY,
  };
}

function region2Reference(pMpa: number, tK: number): Reference {
  const pi = pMpa;
  const tau = 540 / tK;
  const ideal = sumTerms(
    REGION2_IDEAL.map(([j, n]) => [0, j, n] as const),
    pi,
    tau,
  );
  const residual = sumTerms(REGION2_RESIDUAL, pi, tau - 0.5);
  const g = Math.log(pi) + ideal.g + residual.g;
  const gP = 1 / pi + residual.gX;
  const gT = ideal.gY + residual.gY;
  const gTT = ideal.gYY + residual.gYY;
  const rt = R * tK;
  return {
    v: (rt * 1000 * pi * gP) / (pMpa * 1e6),
    h: rt * tau * gT,
    u: rt * (tau * gT - pi * gP),
    s: R * (tau * gT - g),
    cp: -R * tau ** 2 * gTT,
  };
}

function expectSame(actual: number, expected: number, what: string): void {
  const allowed = Math.max(RELATIVE * Math.abs(expected), ABSOLUTE);
  expect(Math.abs(actual - expected), what).toBeLessThanOrEqual(allowed);
}

function expectMatches(
  props: ReturnType<typeof region1Properties>,
  ref: Reference,
  at: string,
): void {
  expectSame(props.specificVolumeM3PerKg, ref.v, `v at ${at}`);
  expectSame(props.enthalpyKjPerKg, ref.h, `h at ${at}`);
  expectSame(props.internalEnergyKjPerKg, ref.u, `u at ${at}`);
  expectSame(props.entropyKjPerKgK, ref.s, `s at ${at}`);
  expectSame(props.isobaricHeatCapacityKjPerKgK, ref.cp, `cp at ${at}`);
}

describe("IF97 fast evaluation against the term-by-term formulation", () => {
  it("agrees over region 1 (p_s(T) to 100 MPa, 273.15 K to 623.15 K)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 273.15, max: 623.15, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (tK, share) => {
          const ps = saturationPressureMpa(tK);
          const pMpa = ps + share * (100 - ps);
          expectMatches(
            region1Properties(pMpa, tK),
            region1Reference(pMpa, tK),
            `${pMpa} MPa, ${tK} K`,
          );
        },
      ),
      { numRuns: 3000 },
    );
  });

  it("agrees over region 2 up to the saturation line (273.15 K to 623.15 K)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 273.15, max: 623.15, noNaN: true }),
        fc.double({ min: 1e-6, max: 1, noNaN: true }),
        (tK, share) => {
          const pMpa = share * saturationPressureMpa(tK);
          expectMatches(
            region2Properties(pMpa, tK),
            region2Reference(pMpa, tK),
            `${pMpa} MPa, ${tK} K`,
          );
        },
      ),
      { numRuns: 3000 },
    );
  });
});
