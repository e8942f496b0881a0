import { describe, expect, it } from "vitest";
import {
  formatMoney,
  monthlyEstimateMinor,
  planQuantity,
  UNIT_PRICE_MINOR,
} from "./plan";

describe("the plan", () => {
  it("charges £29.00 per metered site", () => {
    expect(UNIT_PRICE_MINOR).toBe(2900);
    expect(monthlyEstimateMinor(3)).toBe(8700);
    expect(formatMoney(monthlyEstimateMinor(3))).toBe("£87.00");
  });

  it("never goes below one site", () => {
    expect(planQuantity(0)).toBe(1);
    expect(planQuantity(1)).toBe(1);
    expect(planQuantity(7)).toBe(7);
    expect(monthlyEstimateMinor(0)).toBe(2900);
  });

  it("formats other currencies by their code", () => {
    expect(formatMoney(1234, "eur")).toBe("€12.34");
  });
});
