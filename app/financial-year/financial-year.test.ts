import { describe, expect, it } from "vitest";
import {
  financialQuarter,
  financialQuarterOf,
  financialYear,
  financialYearLabel,
  financialYearOf,
  periodPicks,
} from "./financial-year";

describe("financial year starting in April", () => {
  it("runs April to March and is named by the year it starts in", () => {
    const fy = financialYear(2025, 4);
    expect(fy.from).toBe("2025-04");
    expect(fy.to).toBe("2026-03");
    expect(fy.months).toHaveLength(12);
    expect(fy.label).toBe("FY 2025/26");
  });

  it("puts January to March in the year that started the April before", () => {
    expect(financialYearOf("2026-03", 4)).toBe(2025);
    expect(financialYearOf("2026-04", 4)).toBe(2026);
    expect(financialYearOf("2026-01", 4)).toBe(2025);
    expect(financialYearOf("2025-12", 4)).toBe(2025);
  });

  it("has quarters of three months, Q4 crossing into the next calendar year", () => {
    expect(financialQuarter(2025, 1, 4)).toMatchObject({
      from: "2025-04",
      to: "2025-06",
      label: "Q1 FY 2025/26",
    });
    expect(financialQuarter(2025, 3, 4)).toMatchObject({
      from: "2025-10",
      to: "2025-12",
    });
    expect(financialQuarter(2025, 4, 4).months).toEqual([
      "2026-01",
      "2026-02",
      "2026-03",
    ]);
    expect(financialQuarterOf("2026-02", 4)).toBe(4);
    expect(financialQuarterOf("2025-04", 4)).toBe(1);
    expect(financialQuarterOf("2025-09", 4)).toBe(2);
  });

  it("covers every month once across its four quarters", () => {
    for (const start of [1, 2, 4, 7, 10, 12]) {
      const quarters = [1, 2, 3, 4].flatMap(
        (q) => financialQuarter(2024, q, start).months,
      );
      expect(quarters).toEqual(financialYear(2024, start).months);
    }
  });
});

describe("financial year starting in January", () => {
  it("is the calendar year", () => {
    expect(financialYear(2025, 1)).toMatchObject({
      from: "2025-01",
      to: "2025-12",
      label: "FY 2025",
    });
    expect(financialYearLabel(2099, 10)).toBe("FY 2099/00");
    expect(financialQuarter(2025, 4, 1).from).toBe("2025-10");
  });
});

describe("period picks", () => {
  it("offers the current financial year first, each with its quarters", () => {
    const picks = periodPicks("2026-02", 4, 1);
    expect(picks.map((p) => p.value)).toEqual([
      "fy:2025",
      "fq:2025-Q1",
      "fq:2025-Q2",
      "fq:2025-Q3",
      "fq:2025-Q4",
      "fy:2024",
      "fq:2024-Q1",
      "fq:2024-Q2",
      "fq:2024-Q3",
      "fq:2024-Q4",
    ]);
    expect(picks[4]).toMatchObject({ from: "2026-01", to: "2026-03" });
  });
});
