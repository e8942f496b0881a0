import { describe, expect, it } from "vitest";
import { spreadBudget } from "./spread";

/** Σ of decimal texts with the same decimals, in integers (the test's own arithmetic). */
const total = (values: string[]) =>
  values.reduce((s, v) => s + BigInt(v.replace(".", "")), 0n).toString();
const units = (amount: string, places: number) => {
  const [w, f = ""] = amount.split(".");
  return BigInt(w + f.padEnd(places, "0")).toString();
};

describe("budget spread", () => {
  it("flat: twelve months that add up to the annual budget exactly", () => {
    const months = spreadBudget("1000000", 12, 6);
    expect(months).toHaveLength(12);
    expect(total(months)).toBe(units("1000000", 6));
    // 1,000,000 / 12 = 83,333.333333… : shares differ by at most one unit.
    expect(new Set(months)).toEqual(new Set(["83333.333334", "83333.333333"]));
  });

  it("by degree days: in proportion, and still exact", () => {
    const hdd = [
      310.5, 280.2, 250, 180.7, 90.1, 30, 5.5, 8, 60.3, 150, 240.9, 300,
    ];
    const months = spreadBudget("24999.99", 12, 2, hdd);
    expect(total(months)).toBe(units("24999.99", 2));
    const sumHdd = hdd.reduce((a, b) => a + b, 0);
    months.forEach((m, i) =>
      expect(
        Math.abs(Number(m) - (24999.99 * hdd[i]) / sumHdd),
      ).toBeLessThanOrEqual(0.01),
    );
  });

  it("no degree days at all spreads flat; bad amounts are refused", () => {
    expect(spreadBudget("12", 12, 0, Array(12).fill(0))).toEqual(
      Array(12).fill("1"),
    );
    expect(() => spreadBudget("-5", 12, 2)).toThrow();
    expect(() => spreadBudget("1.234", 12, 2)).toThrow(/decimals/);
  });
});
