// Hydrogen against the CODATA key values and the per-kg figures derived from
// them in references.md §9 (HHV 141.79, LHV 119.96, |ΔG| 117.64 MJ/kg;
// ΔS = −163.306 J/(mol·K); ΔG = −237.140 kJ/mol [computed there]).

import { describe, expect, it } from "vitest";
import { PhysicsError } from "./errors";
import {
  HYDROGEN_MOLAR_MASS_G_PER_MOL,
  hydrogenEnergy,
  molesFromNormalVolume,
  reactionEntropyJMolK,
  reactionGibbsEnergyKjMol,
} from "./hydrogen";

const MJ_PER_KWH = 3.6;

describe("reaction H₂ + ½O₂ → H₂O(l) at 298.15 K", () => {
  it("has ΔS = −163.306 J/(mol·K) from the standard entropies", () => {
    expect(reactionEntropyJMolK().toFixed(3)).toBe("-163.306");
  });

  it("has ΔG = ΔH − TΔS = −237.140 kJ/mol, to the stated digits", () => {
    expect(reactionGibbsEnergyKjMol().toFixed(3)).toBe("-237.140");
  });
});

describe("hydrogenEnergy per kilogram", () => {
  const gross = hydrogenEnergy({ massKg: 1, basis: "gross" });
  const net = hydrogenEnergy({ massKg: 1, basis: "net" });

  it("gives HHV 141.79 MJ/kg on the gross basis", () => {
    expect((gross.energyKwh * MJ_PER_KWH).toFixed(2)).toBe("141.79");
  });

  it("gives LHV 119.96 MJ/kg on the net basis", () => {
    expect((net.energyKwh * MJ_PER_KWH).toFixed(2)).toBe("119.96");
  });

  it("limits the work to |ΔG| = 117.64 MJ/kg whatever the basis", () => {
    expect((gross.maxWorkKwh * MJ_PER_KWH).toFixed(2)).toBe("117.64");
    expect(net.maxWorkKwh).toBe(gross.maxWorkKwh);
  });

  it("keeps the reversible fuel cell's heat T·|ΔS| as the gap between HHV and the work", () => {
    const heatKjMol = (298.15 * -reactionEntropyJMolK()) / 1000;
    const gapKjMol =
      ((gross.energyKwh - gross.maxWorkKwh) * 3600) / gross.moles;
    expect(gapKjMol).toBeCloseTo(heatKjMol, 9);
  });
});

describe("hydrogenEnergy from a normal volume (0 °C, 101.325 kPa)", () => {
  it("counts 44.615 mol in 1 Nm³ by the ideal-gas law", () => {
    // 101325 Pa × 1 m³ / (8.314462618 J/(mol·K) × 273.15 K) = 44.6150 mol;
    // the molar volume 22.413 969 54 L/mol [memory: CODATA 2018] gives the same.
    expect(molesFromNormalVolume(1)).toBeCloseTo(1000 / 22.41396954, 6);
  });

  it("weighs about 0.0899 kg, the normal density of hydrogen [memory]", () => {
    const r = hydrogenEnergy({ volumeNm3: 1, basis: "gross" });
    expect(r.massKg).toBeCloseTo(0.0899, 4);
    expect(r.massKg).toBeCloseTo(
      (44.615 * HYDROGEN_MOLAR_MASS_G_PER_MOL) / 1000,
      5,
    );
  });
});

describe("hydrogenEnergy refuses", () => {
  it.each([
    [{ massKg: -0.1 }, "massKg: must be zero or positive"],
    [{ volumeNm3: -2 }, "volumeNm3: must be zero or positive"],
    [{ massKg: 1, volumeNm3: 1 }, "not both"],
    [{}, "massKg: is required, or volume_nm3"],
  ])("%o", (patch, reason) => {
    expect(() => hydrogenEnergy({ basis: "gross", ...patch })).toThrow(
      PhysicsError,
    );
    expect(() => hydrogenEnergy({ basis: "gross", ...patch })).toThrow(reason);
  });
});
