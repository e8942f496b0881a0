import { describe, expect, it } from "vitest";
import { addExact, convertKwh } from "./convert-energy-decimal";
import { LEDGER_UNITS, ledgerUnits } from "./ledger-units";

describe("ledger unit conversion of exact decimal kWh", () => {
  it("kWh to MWh is a decimal shift, to the last digit", () => {
    expect(convertKwh("1234.567891", "MWh")).toBe("1.234567891");
    // A binary float gets this one wrong: 79141.234567 / 1000 = 79.14123456700001.
    expect(convertKwh("79141.234567", "MWh")).toBe("79.141234567");
    expect(convertKwh("-0.000001", "MWh")).toBe("-0.000000001");
    expect(convertKwh("10.000000", "MWh")).toBe("0.01");
  });

  it("kWh to GJ multiplies by 0.0036 exactly, where a binary float would not", () => {
    // 1 kWh = 3.6 MJ exactly, so 1234.567891 kWh = 4444.4444076 MJ.
    expect(convertKwh("1234.567891", "GJ")).toBe("4.4444444076");
    expect(convertKwh("12345.678901", "GJ")).toBe("44.4444440436");
    expect(String(12345.678901 * 0.0036)).toBe("44.444444043599994");
    expect(convertKwh("0.7", "GJ")).toBe("0.00252");
    // Small figures in full, never with an exponent.
    expect(convertKwh("0.000007", "GJ")).toBe("0.0000000252");
  });

  it("uses the EU/UK therm of 105.5056 MJ and the MMBtu of 10^6 Btu_IT", () => {
    // 36 therm = 3798.2016 MJ = 1055.056 kWh.
    expect(convertKwh("1055.056", "therm")).toBe("36");
    // 9 MMBtu = 9495.50267358 MJ = 2637.63963155 kWh.
    expect(convertKwh("2637.63963155", "MMBtu")).toBe("9");
    expect(LEDGER_UNITS.therm.megajoules).toBe("105.5056");
    expect(LEDGER_UNITS.MMBtu.megajoules).toBe("1055.05585262");
  });

  it("rounds a quotient that does not end once, to 9 places", () => {
    // 1 kWh = 3.6 / 105.5056 therm = 0.0341214115…
    expect(convertKwh("1", "therm")).toBe("0.034121412");
    // 1 kWh = 3.6 / 1055.05585262 MMBtu = 0.003412141633...
    expect(convertKwh("1", "MMBtu")).toBe("0.003412142");
    expect(convertKwh("-1", "MMBtu")).toBe("-0.003412142");
    // Per m²: 100 kWh over 3 m² = 33.333333333… kWh/m².
    expect(convertKwh("100", "kWh", "3")).toBe("33.333333333");
    expect(convertKwh("100", "kWh", "8")).toBe("12.5");
  });

  it("agrees with the float factors to within the rounding, in every unit", () => {
    for (const unit of ledgerUnits) {
      const kwh = 98765.432109;
      const expected = (kwh * 3.6) / Number(LEDGER_UNITS[unit].megajoules);
      expect(Number(convertKwh(String(kwh), unit))).toBeCloseTo(expected, 8);
    }
  });

  it("adds decimal texts exactly", () => {
    expect(addExact(["0.1", "0.2"])).toBe("0.3");
    expect(addExact([])).toBe("0");
    expect(addExact(["-12.500000", "12.5"])).toBe("0");
  });
});
