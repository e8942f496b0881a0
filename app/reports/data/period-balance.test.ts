import { describe, expect, it } from "vitest";
import {
  compareWithBaseline,
  type SavedBaselineRow,
} from "./baseline-comparison";
import { sumDecimals } from "./decimal";
import {
  residuals,
  siteBalanceOf,
  type MeterPeriodEnergy,
} from "./period-balance";
import type { CarrierTable } from "./types";

const meter = (over: Partial<MeterPeriodEnergy>): MeterPeriodEnergy => ({
  id: "p",
  siteId: "s",
  code: "HX0",
  name: "Main",
  carrier: "heat",
  parentMeterId: null,
  energyKwh: "1000",
  ...over,
});

describe("sub-meter residuals over a period", () => {
  it("parent less the sum of its direct sub-meters, flagged beyond the tolerance", () => {
    const [r] = residuals([
      meter({}),
      meter({ id: "a", code: "A", parentMeterId: "p", energyKwh: "600.25" }),
      meter({ id: "b", code: "B", parentMeterId: "p", energyKwh: "339.75" }),
    ]);
    expect(r).toMatchObject({
      code: "HX0",
      childrenKwh: "940.00",
      residualKwh: "60.00",
      childCount: 2,
      flag: "over_tolerance",
    });
    expect(r.residualFraction).toBeCloseTo(0.06, 12);
  });

  it("sub-meters above their parent are a problem of their own", () => {
    const [r] = residuals([
      meter({}),
      meter({ id: "a", parentMeterId: "p", energyKwh: "1000.5" }),
    ]);
    expect(r.flag).toBe("children_exceed_parent");
  });

  it("meters without sub-meters have no residual", () => {
    expect(residuals([meter({})])).toEqual([]);
  });
});

describe("a saved baseline against the report's months", () => {
  const baseline: SavedBaselineRow = {
    id: "b1",
    carrier: "heat",
    from: "2024-01",
    to: "2024-12",
    granularity: "monthly",
    createdAt: "2025-01-05T00:00:00.000Z",
    createdBy: "Someone",
    model: {
      method: "ols",
      driver: "hdd",
      baseC: 15.5,
      granularity: "monthly",
      slope: 2,
      intercept: 100,
      n: 12,
      p: 2,
      r2: 0.9,
      cvrmse: 10,
      nmbe: 0,
      rmse: 5,
      meanKwh: 500,
      points: [
        { month: "2024-01", dd: 100, kwh: 300 },
        { month: "2024-07", dd: 400, kwh: 900 },
      ],
    },
  };
  // February 2025, 28 days at 5.5 °C: HDD = 28 × (15.5 − 5.5) = 280 K·d.
  const temperatures = Array.from({ length: 28 }, (_, i) => ({
    day: `2025-02-${String(i + 1).padStart(2, "0")}`,
    meanTempC: 5.5,
  }));

  it("expects a + b·HDD, and avoided energy is expected less metered", () => {
    const c = compareWithBaseline({
      baseline,
      siteBaseC: 15.5,
      months: ["2025-01", "2025-02"],
      temperatures,
      actualKwh: new Map([
        ["2025-01", 700],
        ["2025-02", 600],
      ]),
    });
    expect(c.months[0]).toMatchObject({
      month: "2025-01",
      dd: null,
      expectedKwh: null,
      note: "no weather",
    });
    expect(c.months[1]).toMatchObject({
      month: "2025-02",
      dd: 280,
      expectedKwh: 660,
      extrapolated: false,
    });
    expect(c.months[1].difference).toBeCloseTo(600 / 660 - 1, 12);
    expect(c).toMatchObject({
      comparedMonths: 1,
      expectedKwh: 660,
      actualKwh: 600,
      avoidedKwh: 60,
    });
    expect(c.assessment.cvrmse.pass).toBe(true);
  });

  it("marks months outside the fitted range", () => {
    const cold = temperatures.map((t) => ({ ...t, meanTempC: -5 }));
    const c = compareWithBaseline({
      baseline,
      siteBaseC: 15.5,
      months: ["2025-02"],
      temperatures: cold,
      actualKwh: new Map([["2025-02", 1000]]),
    });
    // 28 × 20.5 = 574 K·d, above the 400 the model saw.
    expect(c.months[0]).toMatchObject({ dd: 574, extrapolated: true });
  });

  it("carries the page's caution when the model saw under a year of months", () => {
    const args = {
      siteBaseC: 15.5,
      months: ["2025-02"],
      temperatures,
      actualKwh: new Map([["2025-02", 600]]),
    };
    // The fixture's model was fitted on two calendar months.
    expect(compareWithBaseline({ ...args, baseline }).shortFitWarning).toMatch(
      /^Fitted on 2 months, fewer than the 12 of a full year/,
    );
    const year = Array.from({ length: 12 }, (_, m) => ({
      month: `2024-${String(m + 1).padStart(2, "0")}`,
      dd: 100 + 25 * m,
      kwh: 300 + 50 * m,
    }));
    const full = { ...baseline, model: { ...baseline.model, points: year } };
    expect(
      compareWithBaseline({ ...args, baseline: full }).shortFitWarning,
    ).toBeNull();
  });
});

describe("the site balance of a period", () => {
  const table = (
    carrier: CarrierTable["carrier"],
    importsKwh: string,
    exportsKwh = "0",
  ): CarrierTable => ({
    carrier,
    entries: [],
    total: {
      importsKwh,
      exportsKwh,
      netKwh: sumDecimals([importsKwh, exportsKwh]),
      estimatedShare: 0,
      uncertaintyKwh: null,
      adjustmentsKwh: "0",
      adjustmentCount: 0,
      cost: null,
      currency: null,
    },
  });

  it("keeps the ledger's delivered figures per carrier; its net is Q + W, cooling delivered as heat out", () => {
    const balance = siteBalanceOf(
      [
        table("electricity", "50.5", "-10.25"),
        table("cooling", "40.125"),
        table("heat", "100"),
      ],
      [],
    );
    expect(balance.carriers.map((c) => [c.carrier, c.importsKwh])).toEqual([
      ["heat", "100"],
      ["cooling", "40.125"],
      ["electricity", "50.5"],
    ]);
    // 100 of heat in, 40.125 of heat out as cooling, 50.5 − 10.25 of work in.
    expect(balance.netIntoSiteKwh).toBe("100.125");
    expect(balance).not.toHaveProperty("importsKwh");
  });
});
