import { describe, expect, it } from "vitest";
import { PhysicsInputError } from "./errors";
import { pressureVolumeWorkJ } from "./pv-work";

describe("pressure-volume work W = −p_ext·ΔV (IUPAC: work on the system > 0)", () => {
  it("compressing 20 L against 101.325 kPa is +2026.5 J", () => {
    // references.md §7 [computed], IUPAC sign convention.
    expect(pressureVolumeWorkJ(101325, -0.02)).toBeCloseTo(2026.5, 9);
  });

  it("an expansion does work on the surroundings: negative", () => {
    expect(pressureVolumeWorkJ(101325, 0.02)).toBeCloseTo(-2026.5, 9);
  });

  it("no volume change, no work (and not −0)", () => {
    expect(Object.is(pressureVolumeWorkJ(101325, 0), 0)).toBe(true);
  });

  it("rejects a negative or non-finite pressure", () => {
    expect(() => pressureVolumeWorkJ(-1, 0.1)).toThrow(PhysicsInputError);
    expect(() => pressureVolumeWorkJ(1e5, Number.NaN)).toThrow(/finite/);
  });
});
