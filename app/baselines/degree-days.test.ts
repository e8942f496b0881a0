import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  coolingDegreeDays,
  daysInMonth,
  degreeDayLabel,
  heatingDegreeDays,
  meanFromExtremes,
  monthlyDegreeDays,
  monthsBetween,
} from "./degree-days";

describe("degree days of a day (mean-temperature method)", () => {
  it("reproduces the published worked example: 10 °C max, 6 °C min, base 15.5 °C → 7.5 K·d", () => {
    // Chadderton, Building Services Engineering, 5th ed., §2 [read]
    // (references.md §5, "Worked example").
    const mean = meanFromExtremes(10, 6);
    expect(mean).toBe(8);
    expect(heatingDegreeDays(mean, 15.5)).toBe(7.5);
  });

  it("gives the mean-method column of the check table to base 15.5 °C", () => {
    // references.md §5, "Check values to base 15.5 °C", mean-method column
    // [computed from the definition HDD = max(0, θ_b − θ_m)].
    const cases: [number, number, number][] = [
      [10, 6, 7.5],
      [18, 10, 1.5],
      [20, 14, 0],
      [17, 8, 3.0],
      [22, 16, 0],
    ];
    for (const [max, min, hdd] of cases)
      expect(heatingDegreeDays(meanFromExtremes(max, min), 15.5)).toBeCloseTo(
        hdd,
        12,
      );
  });

  it("counts cooling degree days above the base and none below it", () => {
    // CDD = max(0, θ_m − θ_b) (references.md §5; common practice).
    expect(coolingDegreeDays(21, 18)).toBe(3);
    expect(coolingDegreeDays(12, 18)).toBe(0);
    expect(heatingDegreeDays(21, 18)).toBe(0);
  });

  it("HDD − CDD = base − mean, and neither is negative (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -40, max: 45, noNaN: true }),
        fc.double({ min: 0, max: 25, noNaN: true }),
        (mean, base) => {
          const hdd = heatingDegreeDays(mean, base);
          const cdd = coolingDegreeDays(mean, base);
          expect(hdd).toBeGreaterThanOrEqual(0);
          expect(cdd).toBeGreaterThanOrEqual(0);
          expect(hdd * cdd).toBe(0);
          expect(hdd - cdd).toBeCloseTo(base - mean, 9);
        },
      ),
    );
  });

  it("refuses a maximum below the minimum", () => {
    expect(() => meanFromExtremes(5, 6)).toThrow(RangeError);
  });
});

describe("monthly degree days", () => {
  it("sums the days of each month, and knows which months are complete", () => {
    // February 2026: 28 days, alternately 5.5 °C and 10.5 °C, base 15.5 °C:
    // 14 × 10 + 14 × 5 = 210 K·d by hand.
    const february = Array.from({ length: 28 }, (_, i) => ({
      day: `2026-02-${String(i + 1).padStart(2, "0")}`,
      meanTempC: i % 2 === 0 ? 5.5 : 10.5,
    }));
    const march = [
      { day: "2026-03-01", meanTempC: 20.5 },
      { day: "2026-03-02", meanTempC: 15.5 },
    ];
    const outside = { day: "2026-04-01", meanTempC: 0 };
    const [feb, mar] = monthlyDegreeDays(
      [...february, ...march, outside],
      15.5,
      { from: "2026-02", to: "2026-03" },
    );
    expect(feb).toEqual({
      month: "2026-02",
      hdd: 210,
      cdd: 0,
      days: 28,
      daysInMonth: 28,
      complete: true,
    });
    expect(mar).toEqual({
      month: "2026-03",
      hdd: 0,
      cdd: 5,
      days: 2,
      daysInMonth: 31,
      complete: false,
    });
  });

  it("lists months without any temperature, with zero days", () => {
    expect(
      monthlyDegreeDays([], 15.5, { from: "2025-12", to: "2026-01" }),
    ).toEqual([
      {
        month: "2025-12",
        hdd: 0,
        cdd: 0,
        days: 0,
        daysInMonth: 31,
        complete: false,
      },
      {
        month: "2026-01",
        hdd: 0,
        cdd: 0,
        days: 0,
        daysInMonth: 31,
        complete: false,
      },
    ]);
  });

  it("counts a day given twice once, the later value winning", () => {
    const [month] = monthlyDegreeDays(
      [
        { day: "2026-01-05", meanTempC: 0 },
        { day: "2026-01-05", meanTempC: 10 },
      ],
      15.5,
      { from: "2026-01", to: "2026-01" },
    );
    expect(month.days).toBe(1);
    expect(month.hdd).toBe(5.5);
  });

  it("knows the calendar", () => {
    expect(daysInMonth("2024-02")).toBe(29);
    expect(daysInMonth("2025-02")).toBe(28);
    expect(daysInMonth("2100-02")).toBe(28);
    expect(daysInMonth("2000-02")).toBe(29);
    expect(monthsBetween("2024-11", "2025-02")).toEqual([
      "2024-11",
      "2024-12",
      "2025-01",
      "2025-02",
    ]);
    expect(monthsBetween("2025-02", "2025-01")).toEqual([]);
    expect(() => daysInMonth("2025-13")).toThrow(RangeError);
  });
});

describe("degree days as the trade writes them", () => {
  it("names the kind and its base, the temperature kept with its unit", () => {
    expect(degreeDayLabel("hdd", 15.5)).toBe("HDD (15.5\u00a0°C)");
    expect(degreeDayLabel("cdd", 18)).toBe("CDD (18.0\u00a0°C)");
  });
});
