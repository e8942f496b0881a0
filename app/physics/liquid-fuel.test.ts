// Liquid fuels: the energy from a metered volume or a tank's stock balance,
// and the ranges the reasons state (common practice, liquid-fuel.ts).

import { describe, expect, it } from "vitest";
import { PhysicsError } from "./errors";
import { liquidFuelEnergy, stockConsumptionL } from "./liquid-fuel";

// Gas oil, typical gross values [memory, common practice].
const GAS_OIL = { densityKgL: 0.845, calorificValueMjKg: 45.6 };

describe("liquidFuelEnergy", () => {
  it("is L × ρ × CV / 3.6 for a metered volume", () => {
    const r = liquidFuelEnergy({ volumeL: 1000, ...GAS_OIL });
    expect(r.massKg).toBeCloseTo(845, 9);
    // 845 kg × 45.6 MJ/kg = 38 532 MJ = 10 703.3 kWh (1 kWh = 3.6 MJ exactly).
    expect(r.energyKwh).toBeCloseTo(38532 / 3.6, 6);
    // The trade's "about 10.7 kWh per litre of gas oil" (common practice).
    expect(r.energyKwh / 1000).toBeCloseTo(10.7, 1);
  });

  it("takes opening + deliveries − closing from the stock readings", () => {
    const stock = {
      openingStockL: 5200,
      deliveriesL: 9000,
      closingStockL: 6100,
    };
    const r = liquidFuelEnergy({ stock, ...GAS_OIL });
    expect(r.volumeL).toBe(8100);
    expect(r.energyKwh).toBe(
      liquidFuelEnergy({ volumeL: 8100, ...GAS_OIL }).energyKwh,
    );
  });

  it("refuses a negative consumption naming the three fields", () => {
    const stock = { openingStockL: 1000, deliveriesL: 0, closingStockL: 1500 };
    const reason = (() => {
      try {
        stockConsumptionL(stock);
      } catch (e) {
        if (e instanceof PhysicsError) return e.message;
      }
      return "";
    })();
    expect(reason).toContain(
      "opening_stock_l + deliveries_l − closing_stock_l = -500 l",
    );
  });

  it.each([
    [{ volumeL: -1 }, "volumeL: must be zero or positive"],
    [
      { volumeL: 10, densityKgL: 845 },
      "densityKgL: 845 kg/l is outside 0.5 kg/l to 1.1 kg/l",
    ],
    [
      { volumeL: 10, calorificValueMjKg: 12.7 },
      "calorificValueMjKg: 12.7 MJ/kg is outside 20 MJ/kg to 55 MJ/kg",
    ],
    [
      { stock: { openingStockL: -5, deliveriesL: 0, closingStockL: 0 } },
      "openingStockL: must be zero or positive",
    ],
    [
      {
        volumeL: 1,
        stock: { openingStockL: 5, deliveriesL: 0, closingStockL: 0 },
      },
      "not both",
    ],
    [{}, "volumeL: is required"],
  ])("refuses %o", (patch, reason) => {
    expect(() => liquidFuelEnergy({ ...GAS_OIL, ...patch })).toThrow(reason);
  });
});
