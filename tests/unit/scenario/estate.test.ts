import { describe, expect, it } from "vitest";
import {
  METERS,
  SCENARIO_GAPS,
  SCHOOL_METER_SWAP_AT,
  SITES,
  meterByCode,
} from "../../../seeds/scenario/larchmere-estate";
import { REGISTER_START } from "../../../seeds/scenario/generate";

// The checks restate design.md's demo scenario ("Demo scenario") and the
// brief's choices (one CT multiplier, one roll-over, one swap), and the
// school's gas register (issue #15: hcf, a multiplier and a roll-over).

describe("Larchmere estate description", () => {
  it("has seven sites in London time with positive areas", () => {
    expect(SITES).toHaveLength(7);
    for (const s of SITES) {
      expect(s.timeZone).toBe("Europe/London");
      expect(s.floorAreaM2).toBeGreaterThan(0);
    }
  });

  it("gives every meter a unique code and serial, on a known site", () => {
    const codes = new Set(METERS.map((m) => m.code));
    expect(codes.size).toBe(METERS.length);
    expect(new Set(METERS.map((m) => m.serial)).size).toBe(METERS.length);
    const sites = new Set(SITES.map((s) => s.name));
    for (const m of METERS) expect(sites.has(m.siteName)).toBe(true);
    for (const s of SITES) {
      expect(METERS.some((m) => m.siteName === s.name)).toBe(true);
    }
  });

  it("hangs the housing blocks under the main heat meter, on the same site", () => {
    const children = METERS.filter((m) => m.parentCode !== undefined);
    expect(children.map((m) => m.code)).toEqual(["BH-HXA", "BH-HXB", "BH-HXC"]);
    for (const c of children) {
      const parent = meterByCode(c.parentCode!);
      expect(parent.siteName).toBe(c.siteName);
      expect(parent.carrier).toBe(c.carrier);
    }
  });

  it("has chilled water at the library and the data room", () => {
    const cooling = METERS.filter((m) => m.carrier === "cooling");
    expect(cooling.map((m) => m.code).sort()).toEqual(["DR-CW1", "RL-CW1"]);
    expect(cooling.every((m) => m.quantity === "water_heat")).toBe(true);
  });

  it("has one export meter (solar), one steam meter, one CT multiplier", () => {
    expect(METERS.filter((m) => m.orientation === "export")).toEqual([
      expect.objectContaining({ code: "LP-PV1", carrier: "electricity" }),
    ]);
    expect(METERS.filter((m) => m.quantity === "steam_heat")).toHaveLength(1);
    expect(METERS.filter((m) => m.multiplier !== 1)).toEqual([
      expect.objectContaining({ code: "CH-EL1", multiplier: 40 }),
      // The school's imperial gas register counts in tens of hcf.
      expect.objectContaining({ code: "NP-GR1", multiplier: 10 }),
    ]);
  });

  it("has one roll-over register and one swap", () => {
    expect(METERS.filter((m) => m.rolloverKwh !== undefined)).toEqual([
      expect.objectContaining({ code: "RL-EL1", rolloverKwh: 100_000 }),
      // The gas register's roll-over point is in its own unit, hcf.
      expect.objectContaining({ code: "NP-GR1", rolloverKwh: 10_000 }),
    ]);
    const removed = METERS.filter((m) => m.removedAt !== undefined);
    expect(removed).toHaveLength(1);
    const old = removed[0];
    const next = meterByCode(old.replacedByCode!);
    expect(old.removedAt).toBe(SCHOOL_METER_SWAP_AT);
    expect(next.installedAt).toBe(SCHOOL_METER_SWAP_AT);
    expect(next.siteName).toBe(old.siteName);
    expect(next.quantity).toBe(old.quantity);
  });

  it("gives water meters a sensor position and a pressure in range", () => {
    for (const m of METERS.filter((x) => x.quantity === "water_heat")) {
      expect(m.sensorAt).toBeDefined();
      expect(m.defaultPressureBarAbs).toBeGreaterThanOrEqual(1);
      expect(m.defaultPressureBarAbs).toBeLessThanOrEqual(16);
    }
  });

  it("has a starting value for every register and a meter for every gap", () => {
    for (const m of METERS.filter((x) => x.quantity === "electric_register")) {
      expect(REGISTER_START[m.code]).toBeDefined();
    }
    for (const g of SCENARIO_GAPS)
      expect(() => meterByCode(g.meter)).not.toThrow();
    const long = SCENARIO_GAPS.filter((g) => g.hours > 6);
    expect(long).toHaveLength(1);
    expect(long[0].hours).toBe(72);
    const short = SCENARIO_GAPS.filter((g) => g.hours <= 6);
    expect(short.length).toBeGreaterThanOrEqual(4);
    for (const g of short) {
      expect(g.hours).toBeGreaterThanOrEqual(2);
      expect(g.hours).toBeLessThanOrEqual(5);
    }
  });
});
