import { describe, expect, it } from "vitest";
import { readEnergyCell } from "./energy-value";

describe("readEnergyCell", () => {
  it("reads numbers and numeric text, thousands separators included (1,234.5)", () => {
    expect(readEnergyCell(12.5)).toEqual({ kwh: 12.5 });
    expect(readEnergyCell(" 12.5 ")).toEqual({ kwh: 12.5 });
    expect(readEnergyCell("1,234.5")).toEqual({ kwh: 1234.5 });
    expect(readEnergyCell("1,234,567")).toEqual({ kwh: 1234567 });
    expect(readEnergyCell(".5")).toEqual({ kwh: 0.5 });
    expect(readEnergyCell("1.2e3")).toEqual({ kwh: 1200 });
  });

  it("keeps 0 as a reading and a blank as none (a blank is not zero)", () => {
    expect(readEnergyCell("0")).toEqual({ kwh: 0 });
    expect(readEnergyCell(0)).toEqual({ kwh: 0 });
    expect(Object.is((readEnergyCell("-0") as { kwh: number }).kwh, 0)).toBe(
      true,
    );
    expect(readEnergyCell("")).toBeNull();
    expect(readEnergyCell("   ")).toBeNull();
    expect(readEnergyCell(null)).toBeNull();
  });

  it("refuses a negative value and says the meter's orientation gives the sign", () => {
    const r = readEnergyCell("-3.2");
    expect(r).toMatchObject({
      error: expect.stringContaining("-3.2 kWh is negative"),
    });
    expect(r).toMatchObject({ error: expect.stringContaining("orientation") });
    expect(readEnergyCell(-1)).toMatchObject({
      error: expect.stringContaining("negative"),
    });
  });

  it("refuses text that is not a number, and a decimal comma with a hint", () => {
    expect(readEnergyCell("n/a")).toEqual({
      error: '"n/a" is not a number of kWh',
    });
    expect(readEnergyCell("12,5")).toEqual({
      error:
        '"12,5" is not a number of kWh: write decimals with a point (12.5), commas only between thousands (1,234.5)',
    });
    expect(readEnergyCell("1,23,4")).toMatchObject({
      error: expect.stringContaining("not a number"),
    });
    expect(readEnergyCell(".")).toMatchObject({
      error: expect.stringContaining("not a number"),
    });
    expect(readEnergyCell(Number.NaN)).toMatchObject({
      error: expect.stringContaining("not a number"),
    });
    expect(readEnergyCell(true)).toMatchObject({
      error: expect.stringContaining("not a number"),
    });
  });
});
