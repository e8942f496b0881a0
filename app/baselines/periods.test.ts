import { describe, expect, it } from "vitest";
import { isCarrier } from "~/sites/meter-kinds";
import { defaultDriver, isDriver, periodErrors } from "./periods";

const names: [string, string] = ["from", "to"];

describe("baseline periods", () => {
  it("accepts a pair of months in order, up to ten years", () => {
    expect(periodErrors("2025-01", "2025-12", names)).toEqual({});
    expect(periodErrors("2025-03", "2025-03", names)).toEqual({});
    expect(periodErrors("2016-01", "2025-12", names)).toEqual({});
  });

  it("names the field that is wrong", () => {
    expect(periodErrors("2025-13", "2025-12", names)).toEqual({
      from: "Use a month like 2025-01.",
    });
    expect(periodErrors("2025-01", "2025-1", names)).toEqual({
      to: "Use a month like 2025-12.",
    });
    expect(periodErrors("2025-06", "2025-05", names)).toEqual({
      to: "The last month comes before the first.",
    });
    expect(periodErrors("2015-12", "2025-12", names)).toEqual({
      to: "Choose at most 120 months.",
    });
  });

  it("judges order and length only when the first month is a month", () => {
    expect(periodErrors("bad", "2000-01", ["baseFrom", "baseTo"])).toEqual({
      baseFrom: "Use a month like 2025-01.",
    });
  });

  it("knows carriers and degree days, cooling on cooling degree days", () => {
    expect(isCarrier("heat")).toBe(true);
    expect(isCarrier("gas")).toBe(false);
    expect(isCarrier(null)).toBe(false);
    expect(isDriver("cdd")).toBe(true);
    expect(isDriver("HDD")).toBe(false);
    expect(defaultDriver("cooling")).toBe("cdd");
    expect(defaultDriver("electricity")).toBe("hdd");
  });
});
