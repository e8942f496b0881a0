import Decimal from "decimal.js-light";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  dipPeriods,
  fuelEnergyKwh,
  fuelFor,
  intervalEnergies,
  spreadOverIntervals,
  stockConsumption,
  TankBalanceError,
} from "./tank-balance";

const HOUR = 3_600_000;
const at = (iso: string) => new Date(iso);
const gasOil = { densityKgL: "0.845", calorificValueMjKg: "45.5" };
const sum = (xs: { energyKwh: string }[]) =>
  xs.reduce((n, x) => n.plus(x.energyKwh), new Decimal(0)).toFixed(6);

describe("stock consumption", () => {
  it("is opening + deliveries − closing in exact decimals", () => {
    expect(stockConsumption("5200", "1500", "6000")).toBe("700.000");
    // 0.7 + 0.1 − 0.8 is −1.1e-16 in doubles: a false refusal.
    expect(stockConsumption("0.7", "0.1", "0.8")).toBe("0.000");
  });

  it("refuses a negative consumption naming the three fields", () => {
    let error: unknown;
    try {
      stockConsumption("1000", "0", "1200.5");
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(TankBalanceError);
    const refusal = error as TankBalanceError;
    expect(refusal.fields).toEqual([
      "opening_stock_l",
      "deliveries_l",
      "closing_stock_l",
    ]);
    for (const f of refusal.fields) expect(refusal.message).toContain(f);
    expect(refusal.message).toContain("−200.5 l");
  });
});

describe("the fuel of a period", () => {
  it("takes the latest delivery note at or before the closing dip", () => {
    const deliveries = [
      { time: at("2026-01-05T10:00:00Z"), volumeL: "2000", densityKgL: "0.84" },
      {
        time: at("2026-01-20T10:00:00Z"),
        volumeL: "1000",
        calorificValueMjKg: "45.7",
      },
      { time: at("2026-02-10T10:00:00Z"), volumeL: "1000", densityKgL: "0.85" },
    ];
    expect(fuelFor(deliveries, at("2026-02-01T00:00:00Z"), gasOil)).toEqual({
      densityKgL: "0.84",
      calorificValueMjKg: "45.7",
    });
    expect(fuelFor([], at("2026-02-01T00:00:00Z"), gasOil)).toEqual(gasOil);
  });

  it("gives L × ρ × CV / 3.6 rounded to the µkWh", () => {
    // 700 × 0.845 × 45.5 / 3.6 = 26913.25/3.6 = 7475.902777…
    expect(fuelEnergyKwh("700", gasOil)).toBe("7475.902778");
  });
});

describe("dip periods", () => {
  const dips = [
    { time: at("2026-01-01T00:00:00Z"), stockL: "5200" },
    { time: at("2026-01-08T00:00:00Z"), stockL: "4800" },
    { time: at("2026-01-15T00:00:00Z"), stockL: "6000" },
  ];
  const deliveries = [{ time: at("2026-01-10T09:00:00Z"), volumeL: "1500" }];

  it("counts each delivery in the period whose closing dip follows it", () => {
    const periods = dipPeriods(dips, deliveries, gasOil);
    expect(periods.map((p) => [p.deliveriesL, p.consumptionL])).toEqual([
      ["0.000", "400.000"],
      ["1500.000", "300.000"],
    ]);
  });

  it("puts a delivery at a dip's instant before that dip", () => {
    const onDip = [{ time: at("2026-01-08T00:00:00Z"), volumeL: "1500" }];
    const periods = dipPeriods(
      [dips[0], { ...dips[1], stockL: "6300" }, dips[2]],
      onDip,
      gasOil,
    );
    expect(periods.map((p) => p.consumptionL)).toEqual(["400.000", "300.000"]);
  });

  it("refuses when a delivery is missing, and two dips at one instant", () => {
    expect(() => dipPeriods(dips, [], gasOil)).toThrow(/deliveries_l/);
    expect(() => dipPeriods([dips[0], { ...dips[0] }], [], gasOil)).toThrow(
      TankBalanceError,
    );
  });
});

describe("spreading a period's energy over the intervals", () => {
  it("is flat per interval and adds up exactly", () => {
    // 1 kWh over 3 hours: 0.333334, 0.333333, 0.333333.
    const shares = spreadOverIntervals(
      at("2026-01-01T00:00:00Z"),
      at("2026-01-01T03:00:00Z"),
      "1.000000",
      HOUR,
    );
    expect(shares.map((s) => s.energyKwh)).toEqual([
      "0.333334",
      "0.333333",
      "0.333333",
    ]);
  });

  it("weighs a part interval at either end by its overlap", () => {
    const shares = spreadOverIntervals(
      at("2026-01-01T00:30:00Z"),
      at("2026-01-01T02:30:00Z"),
      "4.000000",
      HOUR,
    );
    expect(
      shares.map((s) => [s.intervalStart.toISOString(), s.energyKwh]),
    ).toEqual([
      ["2026-01-01T00:00:00.000Z", "1.000000"],
      ["2026-01-01T01:00:00.000Z", "2.000000"],
      ["2026-01-01T02:00:00.000Z", "1.000000"],
    ]);
  });

  it("always sums to the period's energy, to the µkWh", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 10_000_000 }),
        fc.integer({ min: 1, max: 60 * 24 * 40 }),
        fc.integer({ min: 0, max: 10_000_000_000 }),
        fc.constantFrom(15, 30, 60),
        (startMinute, minutes, micro, step) => {
          const from = new Date(Date.UTC(2025, 0, 1) + startMinute * 60_000);
          const to = new Date(from.getTime() + minutes * 60_000);
          const total = new Decimal(micro).dividedBy(1e6).toFixed(6);
          const shares = spreadOverIntervals(from, to, total, step * 60_000);
          expect(sum(shares)).toBe(total);
          expect(shares.every((s) => !s.energyKwh.startsWith("-"))).toBe(true);
        },
      ),
      { numRuns: 60 },
    );
  });

  it("joins two periods in the interval that holds their dip", () => {
    const periods = dipPeriods(
      [
        { time: at("2026-01-01T00:00:00Z"), stockL: "1000" },
        { time: at("2026-01-01T01:30:00Z"), stockL: "970" },
        { time: at("2026-01-01T03:00:00Z"), stockL: "910" },
      ],
      [],
      gasOil,
    );
    const hours = intervalEnergies(periods, HOUR);
    expect(hours).toHaveLength(3);
    expect(sum(hours)).toBe(
      new Decimal(periods[0].energyKwh).plus(periods[1].energyKwh).toFixed(6),
    );
  });
});
