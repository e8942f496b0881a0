// Verification of the IF97 formulation against the computer-program
// verification values printed in IAPWS R7-97(2012), as transcribed in
// references.md §1. The release asks for agreement in all nine printed
// significant digits; 1e-8 relative allows for the rounding of the ninth.

import { describe, expect, it } from "vitest";
import { PhysicsRangeError } from "./errors";
import {
  IF97_SATURATION_MIN_PRESSURE_MPA,
  boundary23PressureMpa,
  region1Properties,
  region2Properties,
  saturationPressureMpa,
  saturationTemperatureK,
} from "./if97";
import type { WaterProperties } from "./if97";
import { expectRelativeClose } from "./test-helpers";

const TOLERANCE = 1e-8;

interface Row {
  tK: number;
  pMpa: number;
  v: number;
  h: number;
  u: number;
  s: number;
  cp: number;
  w: number;
}

function expectRow(props: WaterProperties, row: Row): void {
  expectRelativeClose(props.specificVolumeM3PerKg, row.v, TOLERANCE);
  expectRelativeClose(props.densityKgPerM3, 1 / row.v, TOLERANCE);
  expectRelativeClose(props.enthalpyKjPerKg, row.h, TOLERANCE);
  expectRelativeClose(props.internalEnergyKjPerKg, row.u, TOLERANCE);
  expectRelativeClose(props.entropyKjPerKgK, row.s, TOLERANCE);
  expectRelativeClose(props.isobaricHeatCapacityKjPerKgK, row.cp, TOLERANCE);
  expectRelativeClose(props.speedOfSoundMPerS, row.w, TOLERANCE);
}

// IAPWS R7-97(2012) Table 5 [read, via references.md §1].
const TABLE_5: Row[] = [
  {
    tK: 300,
    pMpa: 3,
    v: 0.100215168e-2,
    h: 0.115331273e3,
    u: 0.112324818e3,
    s: 0.392294792,
    cp: 0.417301218e1,
    w: 0.150773921e4,
  },
  {
    tK: 300,
    pMpa: 80,
    v: 0.971180894e-3,
    h: 0.184142828e3,
    u: 0.106448356e3,
    s: 0.368563852,
    cp: 0.401008987e1,
    w: 0.163469054e4,
  },
  {
    tK: 500,
    pMpa: 3,
    v: 0.1202418e-2,
    h: 0.975542239e3,
    u: 0.971934985e3,
    s: 0.258041912e1,
    cp: 0.465580682e1,
    w: 0.124071337e4,
  },
];

// IAPWS R7-97(2012) Table 15 [read, via references.md §1].
const TABLE_15: Row[] = [
  {
    tK: 300,
    pMpa: 0.0035,
    v: 0.394913866e2,
    h: 0.254991145e4,
    u: 0.24116916e4,
    s: 0.852238967e1,
    cp: 0.191300162e1,
    w: 0.427920172e3,
  },
  {
    tK: 700,
    pMpa: 0.0035,
    v: 0.923015898e2,
    h: 0.333568375e4,
    u: 0.301262819e4,
    s: 0.101749996e2,
    cp: 0.208141274e1,
    w: 0.644289068e3,
  },
  {
    tK: 700,
    pMpa: 30,
    v: 0.542946619e-2,
    h: 0.263149474e4,
    u: 0.246861076e4,
    s: 0.517540298e1,
    cp: 0.103505092e2,
    w: 0.480386523e3,
  },
];

describe("IF97 region 1 (Eq. 7)", () => {
  for (const row of TABLE_5) {
    it(`matches IAPWS R7-97(2012) Table 5 at ${row.tK} K, ${row.pMpa} MPa`, () => {
      expectRow(region1Properties(row.pMpa, row.tK), row);
    });
  }

  it("rejects liquid states above saturation (p < p_s(T)) with the range", () => {
    // p_s(500 K) = 2.639 MPa (Table 35), so 2 MPa at 500 K is steam.
    expect(() => region1Properties(2, 500)).toThrow(PhysicsRangeError);
    expect(() => region1Properties(2, 500)).toThrow(/region 1.*p_s\(T\)/);
  });

  it("rejects temperatures outside 273.15 K to 623.15 K", () => {
    expect(() => region1Properties(30, 650)).toThrow(/273\.15 to 623\.15/);
    expect(() => region1Properties(3, 273.1)).toThrow(PhysicsRangeError);
    expect(() => region1Properties(101, 300)).toThrow(PhysicsRangeError);
  });
});

describe("IF97 region 2 (Eq. 15, ideal-gas and residual parts)", () => {
  for (const row of TABLE_15) {
    it(`matches IAPWS R7-97(2012) Table 15 at ${row.tK} K, ${row.pMpa} MPa`, () => {
      expectRow(region2Properties(row.pMpa, row.tK), row);
    });
  }

  it("rejects steam below saturation (p > p_s(T)) with the range", () => {
    // p_s(300 K) = 0.003537 MPa (Table 35): 0.1 MPa at 300 K is liquid.
    expect(() => region2Properties(0.1, 300)).toThrow(/region 2/);
  });

  it("bounds region 2 by B23 above 623.15 K (IF97 Eq. 5)", () => {
    // IF97 §4 check value p(623.15 K) = 0.165291643e2 MPa [memory: the
    // release's B23 verification value; not in references.md].
    expectRelativeClose(
      boundary23PressureMpa(623.15),
      0.165291643e2,
      TOLERANCE,
    );
    // 700 K, 30 MPa is Table 15's point; 31 MPa is above B23 there (≈30.48).
    expect(() => region2Properties(30, 700)).not.toThrow();
    expect(() => region2Properties(31, 700)).toThrow(PhysicsRangeError);
  });
});

describe("IF97 region 4, the saturation line", () => {
  // IAPWS R7-97(2012) Table 35 (Eq. 30) [read, via references.md §1].
  const table35 = [
    { tK: 300, pMpa: 0.353658941e-2 },
    { tK: 500, pMpa: 0.263889776e1 },
    { tK: 600, pMpa: 0.123443146e2 },
  ];
  for (const { tK, pMpa } of table35) {
    it(`p_s(${tK} K) matches IAPWS R7-97(2012) Table 35`, () => {
      expectRelativeClose(saturationPressureMpa(tK), pMpa, TOLERANCE);
    });
  }

  // IAPWS R7-97(2012) Table 36 (Eq. 31) [read, via references.md §1].
  const table36 = [
    { pMpa: 0.1, tK: 0.372755919e3 },
    { pMpa: 1, tK: 0.453035632e3 },
    { pMpa: 10, tK: 0.584149488e3 },
  ];
  for (const { pMpa, tK } of table36) {
    it(`T_s(${pMpa} MPa) matches IAPWS R7-97(2012) Table 36`, () => {
      expectRelativeClose(saturationTemperatureK(pMpa), tK, TOLERANCE);
    });
  }

  it("has Eqs. 30 and 31 invert each other (release: consistent)", () => {
    for (const tK of [273.15, 300, 373.15, 450, 523.5, 600, 640]) {
      const back = saturationTemperatureK(saturationPressureMpa(tK));
      expectRelativeClose(back, tK, 1e-12);
    }
  });

  // IF97 §8.1 lower end, 611.213 Pa [read: the region-4 validity note in the
  // c4rnot/if97lib source that references.md §1 names].
  it("starts at 611.213 Pa at 273.15 K", () => {
    expect(IF97_SATURATION_MIN_PRESSURE_MPA * 1e6).toBeCloseTo(611.213, 3);
  });

  it("rejects points off the line's validity", () => {
    expect(() => saturationPressureMpa(273)).toThrow(PhysicsRangeError);
    expect(() => saturationPressureMpa(650)).toThrow(/647\.096/);
    expect(() => saturationTemperatureK(0.0006)).toThrow(PhysicsRangeError);
    expect(() => saturationTemperatureK(23)).toThrow(/22\.064/);
    expect(() => saturationTemperatureK(Number.NaN)).toThrow(/finite/);
  });
});
