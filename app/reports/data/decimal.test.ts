import { describe, expect, it } from "vitest";
import { absDecimal, subtractDecimals, sumDecimals } from "./decimal";

describe("exact decimals", () => {
  it("adds PostgreSQL numeric text without binary rounding", () => {
    // 0.1 + 0.2 is 0.30000000000000004 in binary floating point.
    expect(sumDecimals(["0.1", "0.2"])).toBe("0.3");
    expect(sumDecimals(["4368177.640163", "-41322.500000"])).toBe(
      "4326855.140163",
    );
    expect(sumDecimals(["1.5", "-2", "0.25"])).toBe("-0.25");
    expect(sumDecimals([])).toBe("0");
  });

  it("subtracts and takes magnitudes", () => {
    expect(subtractDecimals("665552.478303", "622648.531804")).toBe(
      "42903.946499",
    );
    expect(subtractDecimals("-1", "0.5")).toBe("-1.5");
    expect(absDecimal("-388592.752210")).toBe("388592.752210");
    expect(absDecimal("\u221212.5")).toBe("12.5");
  });

  it("refuses what is not a decimal", () => {
    expect(() => sumDecimals(["1e3"])).toThrow(/Not a decimal/);
  });
});
