// Reaction enthalpies and work limits of the fuels, checked against the
// values references.md §9 lists with their provenance.
import { describe, expect, it } from "vitest";
import {
  FUEL_RATIOS,
  grossEnergyKwh,
  HYDROGEN_TO_LIQUID_WATER,
  HYDROGEN_TO_WATER_VAPOUR,
  METHANE_TO_LIQUID_WATER,
  reactionEnthalpyKjPerMol,
  reactionEntropyJPerMolK,
  reactionGibbsKjPerMol,
} from "./fuels";

/** M(H₂) = 2.01588 g/mol (references.md §9). */
const HYDROGEN_G_PER_MOL = 2.01588;
const perKgMj = (kjPerMol: number) => Math.abs(kjPerMol) / HYDROGEN_G_PER_MOL;

describe("hydrogen from the CODATA key values (references.md §9)", () => {
  it("ΔS = −163.306 J/(mol·K) and ΔG = −237.140 kJ/mol at 298.15 K [computed there]", () => {
    expect(reactionEntropyJPerMolK(HYDROGEN_TO_LIQUID_WATER)).toBeCloseTo(
      -163.306,
      3,
    );
    expect(reactionGibbsKjPerMol(HYDROGEN_TO_LIQUID_WATER)).toBeCloseTo(
      -237.14,
      3,
    );
  });

  it("per kg: HHV 141.79 MJ, LHV 119.96 MJ, |ΔG| 117.64 MJ [computed there]", () => {
    expect(
      perKgMj(reactionEnthalpyKjPerMol(HYDROGEN_TO_LIQUID_WATER)),
    ).toBeCloseTo(141.79, 2);
    expect(
      perKgMj(reactionEnthalpyKjPerMol(HYDROGEN_TO_WATER_VAPOUR)),
    ).toBeCloseTo(119.96, 2);
    expect(
      perKgMj(reactionGibbsKjPerMol(HYDROGEN_TO_LIQUID_WATER)),
    ).toBeCloseTo(117.64, 2);
  });

  it("a fuel cell's electricity is bounded at 83.0 % of the gross energy (237.140 / 285.830)", () => {
    expect(FUEL_RATIOS.hydrogen.maxWorkToGross).toBeCloseTo(237.14 / 285.83, 5);
  });
});

describe("methane, standing in for natural gas", () => {
  it("burns at 890.3 kJ/mol to liquid water (handbook value [memory])", () => {
    expect(reactionEnthalpyKjPerMol(METHANE_TO_LIQUID_WATER)).toBeCloseTo(
      -890.3,
      1,
    );
  });

  it("has ΔG ≈ −817.9 kJ/mol at 25 °C (handbook value [memory])", () => {
    expect(reactionGibbsKjPerMol(METHANE_TO_LIQUID_WATER)).toBeCloseTo(
      -817.9,
      1,
    );
  });

  it("net ≈ 0.90 × gross, as the trade states for natural gas (references.md §9, common practice)", () => {
    expect(FUEL_RATIOS.natural_gas.netToGross).toBeCloseTo(0.9, 2);
  });
});

describe("gross energy from a stated basis", () => {
  it("leaves gross figures as they are and lifts net ones by the fuel's ratio", () => {
    expect(grossEnergyKwh("gas_oil", 940, "gross")).toBe(940);
    expect(grossEnergyKwh("gas_oil", 940, "net")).toBeCloseTo(1000, 9);
  });

  it("every fuel's ratios lie in (0, 1] and name a source", () => {
    for (const [fuel, r] of Object.entries(FUEL_RATIOS)) {
      expect(r.netToGross, fuel).toBeGreaterThan(0.8);
      expect(r.netToGross, fuel).toBeLessThan(1);
      expect(r.maxWorkToGross, fuel).toBeGreaterThan(0.8);
      expect(r.maxWorkToGross, fuel).toBeLessThanOrEqual(1);
      expect(r.source.length, fuel).toBeGreaterThan(10);
    }
  });
});
