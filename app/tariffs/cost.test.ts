import Decimal from "decimal.js-light";
import { describe, expect, it } from "vitest";
import { bandWeek } from "./band-week";
import { monthCost, type PricedVersion, type SupplyInterval } from "./cost";
import { localQuarter } from "./local-time";
import type { TariffRates } from "./tariff-schema";

function rates(over: Partial<TariffRates> = {}): TariffRates {
  return {
    bands: [
      { name: "Day", rate_per_kwh: "0.30", windows: "Mon-Sun 07:00-23:00" },
      { name: "Night", rate_per_kwh: "0.10", windows: "Mon-Sun 23:00-07:00" },
    ],
    standing_charge_per_day: "0",
    capacity_charge_per_day: "0",
    max_demand_rate_per_kw_month: "0",
    levies: [],
    export_rate_per_kwh: null,
    vat_percent: "0",
    ...over,
  };
}

function version(
  from: string,
  to: string | null,
  r: TariffRates,
): PricedVersion {
  const week = bandWeek(r.bands);
  if (!week.ok) throw new Error(week.reason);
  return { validFrom: from, validTo: to, rates: r, week: week.value };
}

const hour = (iso: string, kwh: string, minutes = 60): SupplyInterval => ({
  startMs: Date.parse(iso),
  minutes,
  deliveredKwh: kwh,
});

const LONDON = "Europe/London";

describe("band resolution in local time", () => {
  it("London's spring-forward day: 05:00 UTC is 06:00 local (night), 06:00 UTC is 07:00 local (day)", () => {
    // 30 March 2025: clocks go 01:00 → 02:00.
    const r = monthCost({
      timeZone: LONDON,
      month: "2025-03",
      versions: [version("2025-01-01", null, rates())],
      intervals: [
        hour("2025-03-30T05:00:00Z", "10"),
        hour("2025-03-30T06:00:00Z", "10"),
      ],
    });
    expect(r.versions[0].bands).toEqual([
      { name: "Day", kwh: "10", cost: "3" },
      { name: "Night", kwh: "10", cost: "1" },
    ]);
  });

  it("the autumn day's repeated hour is priced twice at its band, and a winter 06:00 UTC is night", () => {
    // 26 October 2025: 01:00–02:00 local happens twice (00:00 and 01:00 UTC).
    expect(
      localQuarter(LONDON, Date.parse("2025-10-26T00:00:00Z")).weekQuarter % 96,
    ).toBe(4);
    expect(
      localQuarter(LONDON, Date.parse("2025-10-26T01:00:00Z")).weekQuarter % 96,
    ).toBe(4);
    const r = monthCost({
      timeZone: LONDON,
      month: "2025-10",
      versions: [version("2025-01-01", null, rates())],
      intervals: [
        hour("2025-10-26T00:00:00Z", "5"),
        hour("2025-10-26T01:00:00Z", "5"),
        hour("2025-10-27T06:00:00Z", "4"), // 06:00 GMT: night
        hour("2025-10-27T07:00:00Z", "4"), // 07:00 GMT: day
      ],
    });
    expect(r.cost).toBe(
      new Decimal("14")
        .times("0.10")
        .plus(new Decimal(4).times("0.30"))
        .toString(),
    );
  });

  it("an hour across a band edge in a :30 zone splits its energy into exact halves", () => {
    // Asia/Kolkata is UTC+5:30: 01:00 UTC is 06:30 local, so half the hour is night, half day.
    const r = monthCost({
      timeZone: "Asia/Kolkata",
      month: "2025-06",
      versions: [version("2025-01-01", null, rates())],
      intervals: [hour("2025-06-02T01:00:00Z", "3")],
    });
    expect(r.versions[0].bands).toEqual([
      { name: "Day", kwh: "1.5", cost: "0.45" },
      { name: "Night", kwh: "1.5", cost: "0.15" },
    ]);
  });
});

describe("charges and proration", () => {
  it("standing and capacity per day, a mid-month change prorated by days, VAT on each version", () => {
    const r = monthCost({
      timeZone: LONDON,
      month: "2025-07",
      versions: [
        version(
          "2025-01-01",
          "2025-07-14",
          rates({
            standing_charge_per_day: "1.10",
            capacity_charge_per_day: "0.5",
            vat_percent: "20",
          }),
        ),
        version(
          "2025-07-15",
          null,
          rates({ standing_charge_per_day: "1.30", vat_percent: "5" }),
        ),
      ],
      intervals: [],
    });
    expect(r.versions.map((v) => v.days)).toEqual([14, 17]);
    // (14 × 1.10 + 14 × 0.5) × 1.2 + 17 × 1.30 × 1.05
    expect(r.cost).toBe(
      new Decimal("22.4")
        .times("1.2")
        .plus(new Decimal("22.1").times("1.05"))
        .toString(),
    );
  });

  it("maximum demand from the intervals at each meter's resolution, summed across meters, prorated when a version covers part of the month", () => {
    const md = rates({ max_demand_rate_per_kw_month: "3" });
    const intervals = [
      hour("2025-02-03T10:00:00Z", "2.5", 15), // 10 kW
      hour("2025-02-03T10:00:00Z", "20", 60), // 20 kW in each of its quarters
      hour("2025-02-03T11:00:00Z", "12", 30), // 24 kW
    ];
    const whole = monthCost({
      timeZone: LONDON,
      month: "2025-02",
      versions: [version("2025-01-01", null, md)],
      intervals,
    });
    expect(whole.versions[0].max_demand_kw).toBe("30");
    expect(whole.versions[0].max_demand).toBe("90");
    const part = monthCost({
      timeZone: LONDON,
      month: "2025-02",
      versions: [version("2025-02-01", "2025-02-10", md)],
      intervals,
    });
    // 90 × 10 / 28 = 32.142857142857… → 6 places, half to even.
    expect(part.versions[0].max_demand).toBe("32.142857");
  });

  it("exports are credited only at an export rate; levies on bought energy only", () => {
    const intervals = [
      hour("2025-05-05T12:00:00Z", "-8"),
      hour("2025-05-05T13:00:00Z", "2"),
    ];
    const without = monthCost({
      timeZone: LONDON,
      month: "2025-05",
      versions: [version("2025-01-01", null, rates())],
      intervals,
    });
    expect(without.cost).toBe("0.6");
    const withExport = monthCost({
      timeZone: LONDON,
      month: "2025-05",
      versions: [
        version(
          "2025-01-01",
          null,
          rates({
            export_rate_per_kwh: "0.05",
            levies: [{ name: "L", rate_per_kwh: "0.01" }],
          }),
        ),
      ],
      intervals,
    });
    expect(withExport.versions[0].export_credit).toBe("-0.4");
    expect(withExport.cost).toBe("0.22");
  });

  it("a month's cost is the exact sum of many small interval costs (no float drift)", () => {
    const intervals = Array.from({ length: 1000 }, (_, i) =>
      hour(new Date(Date.UTC(2025, 0, 1) + i * 3_600_000).toISOString(), "0.1"),
    ).filter((iv) => iv.startMs < Date.UTC(2025, 1, 1));
    const flat = rates({
      bands: [
        { name: "All", rate_per_kwh: "0.3", windows: "Mon-Sun 00:00-24:00" },
      ],
    });
    const r = monthCost({
      timeZone: "UTC",
      month: "2025-01",
      versions: [version("2025-01-01", null, flat)],
      intervals,
    });
    expect(intervals.length).toBe(744);
    expect(r.cost).toBe("22.32");
  });
});
