import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { PhysicsRangeError } from "../physics/errors";
import { registerDeltas } from "./register-series";
import type { RegisterRead } from "./register-series";

// Check values are subtraction on the stated definitions (difference of two
// register states × multiplier; wrap past the roll-over point); the half-span
// roll-over rule is the physics module's (app/physics/electric.ts).

const at = (h: number) => new Date(Date.UTC(2026, 0, 1, h));
const reads = (...values: number[]): RegisterRead[] =>
  values.map((registerKwh, i) => ({ time: at(i), registerKwh }));

describe("registerDeltas", () => {
  it("differences consecutive reads", () => {
    const d = registerDeltas(reads(100, 101.5, 104));
    expect(d).toEqual([
      { from: at(0), to: at(1), energyKwh: 1.5, flag: null },
      { from: at(1), to: at(2), energyKwh: 2.5, flag: null },
    ]);
  });

  it("applies the multiplier: a 40:1 CT turns 0.75 register kWh into 30 kWh", () => {
    const d = registerDeltas(reads(10, 10.75), { multiplier: 40 });
    expect(d[0].energyKwh).toBe(30);
  });

  it("reads a wrap past 100 000 kWh as a roll-over", () => {
    // 99 999.5 → 1.5 on a register that wraps at 100 000: 2 kWh.
    const d = registerDeltas(reads(99_999.5, 1.5), { capacityKwh: 100_000 });
    expect(d[0].flag).toBe("rollover");
    expect(d[0].energyKwh).toBeCloseTo(2, 9);
  });

  it("flags a drop with no known roll-over point as register_drop, 0 kWh", () => {
    const d = registerDeltas(reads(48_213.7, 3.2, 5.0));
    expect(d[0]).toMatchObject({ energyKwh: 0, flag: "register_drop" });
    expect(d[1]).toMatchObject({ flag: null });
    expect(d[1].energyKwh).toBeCloseTo(1.8, 9);
  });

  it("flags a drop too large to be a roll-over as register_drop", () => {
    // 40 000 → 3: a wrap would mean 60 003 kWh in one step, not under half
    // the 100 000 kWh span, so it is a swap or fault, not a roll-over.
    const d = registerDeltas(reads(40_000, 3), { capacityKwh: 100_000 });
    expect(d[0]).toMatchObject({ energyKwh: 0, flag: "register_drop" });
  });

  it("gives nothing for fewer than two reads", () => {
    expect(registerDeltas([])).toEqual([]);
    expect(registerDeltas(reads(5))).toEqual([]);
  });

  it("rejects reads out of time order", () => {
    const r = reads(1, 2);
    expect(() => registerDeltas([r[1], r[0]])).toThrow(/increasing/);
    expect(() => registerDeltas([r[0], r[0]])).toThrow(/increasing/);
  });

  it("passes on the physics range error for a read at the roll-over point", () => {
    expect(() =>
      registerDeltas(reads(5, 100_000), { capacityKwh: 100_000 }),
    ).toThrow(PhysicsRangeError);
  });

  it("property: deltas are never negative, and add up to the advance", () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 0, max: 999_999 }), {
          minLength: 2,
          maxLength: 50,
        }),
        fc.option(fc.constant(100_000), { nil: undefined }),
        fc.integer({ min: 1, max: 80 }),
        (tenths, capacityKwh, multiplier) => {
          // 0.0 to 99 999.9 kWh: every value is below the roll-over point.
          const values = tenths.map((t) => t / 10);
          const d = registerDeltas(reads(...values), {
            capacityKwh,
            multiplier,
          });
          expect(d).toHaveLength(values.length - 1);
          for (const x of d) {
            expect(x.energyKwh).toBeGreaterThanOrEqual(0);
            if (x.flag === "register_drop") expect(x.energyKwh).toBe(0);
          }
        },
      ),
      { numRuns: 500 },
    );
  });

  it("property: a rising register's deltas sum to last − first", () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 0, max: 10_000 }), { maxLength: 40 }),
        (steps) => {
          const values = [0];
          for (const s of steps) values.push(values.at(-1)! + s / 10);
          const d = registerDeltas(reads(...values));
          const total = d.reduce((a, x) => a + x.energyKwh, 0);
          expect(total).toBeCloseTo(values.at(-1)!, 6);
          expect(d.every((x) => x.flag === null)).toBe(true);
        },
      ),
    );
  });
});
