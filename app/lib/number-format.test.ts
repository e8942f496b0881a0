import { describe, expect, it } from "vitest";
import { formatKwh, formatNumber, formatSigned } from "./number-format";

describe("number format", () => {
  it("writes British grouping with a fixed number of decimals", () => {
    expect(formatNumber(12345.678)).toBe("12,346");
    expect(formatNumber(12345.678, 2)).toBe("12,345.68");
    expect(formatNumber(0.5, 1)).toBe("0.5");
    expect(formatNumber(3, 2)).toBe("3.00");
  });

  it("writes a dash where there is no figure", () => {
    for (const missing of [null, undefined, NaN, Infinity])
      expect(formatNumber(missing)).toBe("—");
    expect(formatKwh(null)).toBe("—");
    expect(formatSigned(NaN)).toBe("—");
  });

  it("signs with a real minus, and leaves what shows as zero unsigned", () => {
    expect(formatSigned(-1234.4)).toBe("\u22121,234");
    expect(formatSigned(2.25, 1)).toBe("+2.3");
    expect(formatSigned(-0.04, 1)).toBe("0.0");
    expect(formatSigned(0)).toBe("0");
  });

  it("writes energy in whole kWh", () => {
    expect(formatKwh(98765.4)).toBe("98,765 kWh");
    expect(formatKwh(0)).toBe("0 kWh");
  });
});
