import { describe, expect, it } from "vitest";
import { carriers } from "~/sites/meter-kinds";
import { deliveredSign, deliveredSignSql } from "./delivered";

describe("the delivered view's sign", () => {
  it("turns cooling only: its delivery is heat leaving the site", () => {
    expect(
      Object.fromEntries(carriers.map((c) => [c, deliveredSign(c)])),
    ).toEqual({
      heat: 1,
      cooling: -1,
      steam: 1,
      electricity: 1,
      // Fuels are bought: delivered energy, into the site.
      natural_gas: 1,
      gas_oil: 1,
      kerosene: 1,
      lpg: 1,
      biomass: 1,
      hydrogen: 1,
    });
  });

  it("says the same in SQL", () => {
    expect(deliveredSignSql("m.carrier")).toBe(
      "(case when m.carrier in ('cooling') then -1 else 1 end)",
    );
  });
});
