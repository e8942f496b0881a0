import { describe, expect, it } from "vitest";
import { PhysicsInputError, PhysicsRangeError } from "./errors";
import {
  ROLLOVER_MAX_FRACTION,
  differenceRegister,
  electricWork,
} from "./electric";

describe("electrical work from circuit quantities", () => {
  it("24 V × 2.5 A × 8 h DC = 1.728 MJ = 0.48 kWh", () => {
    // references.md §4 and §8 [computed from the definitions].
    const r = electricWork({
      circuit: "dc",
      volts: 24,
      amps: 2.5,
      seconds: 8 * 3600,
    });
    expect(r.energyJ).toBeCloseTo(1_728_000, 6);
    expect(r.energyJ / 3.6e6).toBeCloseTo(0.48, 12);
    expect(r.powerFactor).toBeNull();
  });

  it("single-phase P = V·I·cos φ: 230 V, 10 A, pf 0.9, 1 h = 2.07 kWh", () => {
    // Plain arithmetic from the textbook formula (references.md §4).
    const r = electricWork({
      circuit: "single_phase",
      volts: 230,
      amps: 10,
      powerFactor: 0.9,
      seconds: 3600,
    });
    expect(r.energyJ / 3.6e6).toBeCloseTo(2.07, 12);
  });

  it("defaults the power factor to 1 for AC", () => {
    const r = electricWork({
      circuit: "single_phase",
      volts: 230,
      amps: 10,
      seconds: 1,
    });
    expect(r.activePowerW).toBe(2300);
    expect(r.powerFactor).toBe(1);
  });

  it("three-phase: √3·V_LL·I·cos φ equals 3·V_LN·I·cos φ", () => {
    // references.md §4: balanced three-phase, textbook / common practice.
    const vln = 230;
    const ll = electricWork({
      circuit: "three_phase",
      volts: Math.sqrt(3) * vln,
      amps: 31.5,
      powerFactor: 0.93,
      seconds: 3600,
    });
    const ln = electricWork({
      circuit: "three_phase",
      volts: vln,
      voltageBasis: "line_to_neutral",
      amps: 31.5,
      powerFactor: 0.93,
      seconds: 3600,
    });
    expect(ll.energyJ).toBeCloseTo(ln.energyJ, 6);
    expect(ln.activePowerW).toBeCloseTo(3 * 230 * 31.5 * 0.93, 9);
  });

  it("three-phase at 400 V line-to-line, 31.5 A, pf 0.93 is 20.296 kW", () => {
    // design.md's EL-3 example; √3 × 400 × 31.5 × 0.93 [computed].
    const r = electricWork({
      circuit: "three_phase",
      volts: 400,
      amps: 31.5,
      powerFactor: 0.93,
      seconds: 3600,
    });
    expect(r.activePowerW).toBeCloseTo(20296.17, 2);
  });

  it("rejects a power factor outside 0 < pf ≤ 1", () => {
    const base = {
      circuit: "single_phase",
      volts: 230,
      amps: 1,
      seconds: 1,
    } as const;
    for (const pf of [0, -0.5, 1.01, Number.NaN]) {
      expect(() => electricWork({ ...base, powerFactor: pf })).toThrow(
        /powerFactor/,
      );
    }
    expect(() => electricWork({ ...base, powerFactor: 1.2 })).toThrow(
      PhysicsRangeError,
    );
  });

  it("rejects AC-only and three-phase-only options where they do not apply", () => {
    expect(() =>
      electricWork({
        circuit: "dc",
        volts: 24,
        amps: 1,
        seconds: 1,
        powerFactor: 0.9,
      }),
    ).toThrow(/AC circuits only/);
    expect(() =>
      electricWork({
        circuit: "single_phase",
        volts: 230,
        amps: 1,
        seconds: 1,
        voltageBasis: "line_to_neutral",
      }),
    ).toThrow(/three-phase circuits only/);
  });

  it("rejects negative magnitudes and durations", () => {
    expect(() =>
      electricWork({ circuit: "dc", volts: 24, amps: -1, seconds: 1 }),
    ).toThrow(PhysicsInputError);
    expect(() =>
      electricWork({ circuit: "dc", volts: 24, amps: 1, seconds: -1 }),
    ).toThrow(/seconds/);
  });
});

describe("cumulative register differencing", () => {
  it("differences an advancing register and applies the multiplier", () => {
    const r = differenceRegister({
      startKwh: 48200.5,
      endKwh: 48213.7,
      multiplier: 40,
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.kind).toBe("advance");
    expect(r.registerDeltaKwh).toBeCloseTo(13.2, 9);
    expect(r.energyKwh).toBeCloseTo(528, 9);
  });

  it("reads a drop near the capacity as one roll-over", () => {
    const r = differenceRegister({
      startKwh: 99990,
      endKwh: 5,
      capacityKwh: 100000,
    });
    expect(r).toMatchObject({
      ok: true,
      kind: "rollover",
      registerDeltaKwh: 15,
    });
  });

  it("flags a drop with no known roll-over point as register_drop", () => {
    const r = differenceRegister({ startKwh: 48213.7, endKwh: 12 });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.kind).toBe("register_drop");
    expect(r.reason).toMatch(/meter swap, reset or fault/);
  });

  it("flags a drop whose wrap would be implausibly large as register_drop", () => {
    // Wrapped advance 100000 − 48213.7 + 12 = 51798.3 kWh ≥ half the span.
    const r = differenceRegister({
      startKwh: 48213.7,
      endKwh: 12,
      capacityKwh: 100000,
    });
    expect(r).toMatchObject({ ok: false, kind: "register_drop" });
  });

  it("puts the plausibility limit at exactly half the span, exclusive", () => {
    expect(ROLLOVER_MAX_FRACTION).toBe(0.5);
    const atHalf = differenceRegister({
      startKwh: 60000,
      endKwh: 10000,
      capacityKwh: 100000,
    });
    const below = differenceRegister({
      startKwh: 60000,
      endKwh: 9999,
      capacityKwh: 100000,
    });
    expect(atHalf.ok).toBe(false);
    expect(below).toMatchObject({
      ok: true,
      kind: "rollover",
      registerDeltaKwh: 49999,
    });
  });

  it("never returns negative energy, whatever the two reads", () => {
    const reads = [0, 1, 12, 5000, 49999, 50001, 99990, 99999.9];
    for (const s of reads) {
      for (const e of reads) {
        for (const cap of [undefined, 100000]) {
          const r = differenceRegister({
            startKwh: s,
            endKwh: e,
            capacityKwh: cap,
          });
          if (r.ok) expect(r.energyKwh).toBeGreaterThanOrEqual(0);
          else expect(e).toBeLessThan(s);
        }
      }
    }
  });

  it("rejects reads at or above the capacity, negative reads and bad multipliers", () => {
    expect(() =>
      differenceRegister({ startKwh: 100000, endKwh: 5, capacityKwh: 100000 }),
    ).toThrow(/startKwh: .*roll-over point/);
    expect(() => differenceRegister({ startKwh: -1, endKwh: 5 })).toThrow(
      PhysicsInputError,
    );
    expect(() =>
      differenceRegister({ startKwh: 1, endKwh: 5, multiplier: 0 }),
    ).toThrow(/multiplier/);
  });
});
