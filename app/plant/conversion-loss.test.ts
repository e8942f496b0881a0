import { describe, expect, it } from "vitest";
import { conversionLoss } from "./conversion-loss";

describe("a plant month's conversion loss", () => {
  it("is a boiler's fuel less its heat", () => {
    expect(
      conversionLoss("boiler", { fuel_in: 10_000, heat_out: 8_800 }),
    ).toEqual({ fuelInKwh: 10_000, outputsKwh: 8_800, lossKwh: 1_200 });
  });

  it("is a CHP's fuel less its heat and its electricity", () => {
    expect(
      conversionLoss("chp", {
        fuel_in: 10_000,
        heat_out: 5_000,
        electricity_out: 3_500,
      }),
    ).toEqual({ fuelInKwh: 10_000, outputsKwh: 8_500, lossKwh: 1_500 });
  });

  it("turns negative when the outputs over-read, for the fault to show", () => {
    expect(
      conversionLoss("boiler", { fuel_in: 10_000, heat_out: 10_500 })?.lossKwh,
    ).toBe(-500);
  });

  it("is none for heat pumps and chillers, or while a role has no data", () => {
    expect(
      conversionLoss("heat_pump", { electricity_in: 1_000, heat_out: 3_200 }),
    ).toBeNull();
    expect(conversionLoss("boiler", { fuel_in: 10_000 })).toBeNull();
    expect(
      conversionLoss("fuel_cell", { fuel_in: 10_000, heat_out: 4_000 }),
    ).toBeNull();
  });
});
