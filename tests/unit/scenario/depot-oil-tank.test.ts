import { describe, expect, it } from "vitest";
import { dipPeriods } from "../../../app/tanks/tank-balance";
import {
  OIL_TANK,
  oilTankHistory,
} from "../../../seeds/scenario/depot-oil-tank";

describe("the demo's oil tank", () => {
  const { dips, deliveries } = oilTankHistory();
  const periods = dipPeriods(dips, deliveries, OIL_TANK);

  it("is dipped weekly for two years with a few deliveries, never over capacity", () => {
    expect(dips.length).toBeGreaterThanOrEqual(104);
    expect(deliveries.length).toBeGreaterThanOrEqual(2);
    expect(deliveries.length).toBeLessThanOrEqual(8);
    for (const dip of dips) {
      expect(Number(dip.stockL)).toBeGreaterThanOrEqual(0);
      expect(Number(dip.stockL)).toBeLessThanOrEqual(OIL_TANK.capacityL);
    }
  });

  it("burns a positive amount every week, more in winter", () => {
    expect(periods.every((p) => Number(p.consumptionL) > 0)).toBe(true);
    const litresIn = (month: number) =>
      periods
        .filter((p) => p.from.getUTCMonth() === month)
        .reduce((n, p) => n + Number(p.consumptionL), 0);
    expect(litresIn(0)).toBeGreaterThan(3 * litresIn(6));
  });
});
