import { describe, expect, it } from "vitest";
import { defaultPeriods, joinMonths, pointsIn, shiftMonth } from "./analysis";
import { monthlyDegreeDays } from "./degree-days";

describe("months for a baseline", () => {
  const days = [
    ...Array.from({ length: 31 }, (_, i) => ({
      day: `2026-01-${String(i + 1).padStart(2, "0")}`,
      meanTempC: 5.5,
    })),
    { day: "2026-02-01", meanTempC: 0 },
    ...Array.from({ length: 31 }, (_, i) => ({
      day: `2026-03-${String(i + 1).padStart(2, "0")}`,
      meanTempC: 20.5,
    })),
  ];
  const degreeDays = monthlyDegreeDays(days, 15.5, {
    from: "2026-01",
    to: "2026-04",
  });
  const energy = [
    { month: "2026-01", kwh: 3100, estimatedKwh: 0 },
    { month: "2026-02", kwh: 2000, estimatedKwh: 100 },
    { month: "2026-04", kwh: 500, estimatedKwh: 0 },
  ];

  it("uses a month only with complete weather and a ledger entry, and says why not", () => {
    const months = joinMonths(degreeDays, energy, "hdd");
    expect(months.map((m) => [m.month, m.dd, m.usable, m.note])).toEqual([
      ["2026-01", 310, true, null],
      ["2026-02", 15.5, false, "weather for 1 of 28 days"],
      ["2026-03", 0, false, "no ledger entry"],
      ["2026-04", 0, false, "no weather"],
    ]);
    expect(pointsIn(months, { from: "2026-01", to: "2026-12" })).toEqual([
      { month: "2026-01", dd: 310, kwh: 3100 },
    ]);
  });

  it("takes cooling degree days when asked", () => {
    const months = joinMonths(degreeDays, energy, "cdd");
    expect(months[2].dd).toBe(155);
    expect(months[0].dd).toBe(0);
  });

  it("proposes the last twelve months for reporting and the twelve before as baseline", () => {
    expect(defaultPeriods("2024-12", "2026-11")).toEqual({
      baseFrom: "2024-12",
      baseTo: "2025-11",
      reportFrom: "2025-12",
      reportTo: "2026-11",
    });
    expect(defaultPeriods("2025-03", "2026-06")).toEqual({
      baseFrom: "2025-03",
      baseTo: "2026-02",
      reportFrom: "2026-03",
      reportTo: "2026-06",
    });
    expect(defaultPeriods("2026-01", "2026-06").baseTo).toBe("2026-06");
    expect(shiftMonth("2025-01", -1)).toBe("2024-12");
    expect(shiftMonth("2025-12", 1)).toBe("2026-01");
  });
});
