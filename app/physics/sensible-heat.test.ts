import { describe, expect, it } from "vitest";
import { PhysicsInputError, PhysicsRangeError } from "./errors";
import { sensibleHeatKj } from "./sensible-heat";

describe("sensible heat Q = m·c·(t_in − t_out)", () => {
  it("1 kg of water, 60 → 10 °C with c = 4.18 kJ/(kg·K) gives up 209 kJ", () => {
    // references.md §8, common practice (c ≈ 4.18 kJ/(kg·K)).
    const q = sensibleHeatKj({
      massKg: 1,
      specificHeatKjPerKgK: 4.18,
      inletTempC: 60,
      outletTempC: 10,
    });
    expect(q).toBeCloseTo(209, 9);
  });

  it("is negative when the medium leaves warmer than it came (it took heat)", () => {
    // The same 209 kJ, common practice, the other way round.
    const q = sensibleHeatKj({
      massKg: 1,
      specificHeatKjPerKgK: 4.18,
      inletTempC: 10,
      outletTempC: 60,
    });
    expect(q).toBeCloseTo(-209, 9);
  });

  it("gives 64 800 kJ for design.md's 900 kg, 3.6 kJ/(kg·K), 80 → 60 °C", () => {
    // design.md Gateway API example; plain arithmetic [computed].
    const q = sensibleHeatKj({
      massKg: 900,
      specificHeatKjPerKgK: 3.6,
      inletTempC: 80,
      outletTempC: 60,
    });
    expect(q).toBeCloseTo(64800, 6);
  });

  it("rejects a zero, negative or non-finite specific heat", () => {
    const base = { massKg: 1, inletTempC: 20, outletTempC: 10 };
    for (const c of [0, -4.18, Number.NaN, Infinity]) {
      expect(() =>
        sensibleHeatKj({ ...base, specificHeatKjPerKgK: c }),
      ).toThrow(PhysicsInputError);
    }
  });

  it("rejects negative mass and temperatures below absolute zero", () => {
    const base = {
      massKg: 1,
      specificHeatKjPerKgK: 2,
      inletTempC: 20,
      outletTempC: 10,
    };
    expect(() => sensibleHeatKj({ ...base, massKg: -1 })).toThrow(/massKg/);
    expect(() => sensibleHeatKj({ ...base, outletTempC: -300 })).toThrow(
      PhysicsRangeError,
    );
    expect(() => sensibleHeatKj({ ...base, inletTempC: Number.NaN })).toThrow(
      /finite/,
    );
  });
});
