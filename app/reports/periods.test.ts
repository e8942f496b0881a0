import { describe, expect, it } from "vitest";
import { anchorFor, reportPeriod, reportPeriodFields } from "./periods";

describe("reportPeriod", () => {
  it("a month is one month, ending on the first of the next", () => {
    expect(reportPeriod("month", "2026-03")).toEqual({
      kind: "month",
      start: "2026-03-01",
      end: "2026-04-01",
      months: ["2026-03-01"],
      label: "March 2026",
    });
  });

  it("December ends on the first of January of the next year", () => {
    const p = reportPeriod("month", "2025-12");
    expect(p.end).toBe("2026-01-01");
    expect(p.label).toBe("December 2025");
  });

  it("a quarter is three months", () => {
    expect(reportPeriod("quarter", "2026-Q1")).toEqual({
      kind: "quarter",
      start: "2026-01-01",
      end: "2026-04-01",
      months: ["2026-01-01", "2026-02-01", "2026-03-01"],
      label: "Q1 2026",
    });
    const q4 = reportPeriod("quarter", "2025-Q4");
    expect(q4.months).toEqual(["2025-10-01", "2025-11-01", "2025-12-01"]);
    expect(q4.end).toBe("2026-01-01");
  });

  it("a year is twelve months", () => {
    const p = reportPeriod("year", "2025");
    expect(p.start).toBe("2025-01-01");
    expect(p.end).toBe("2026-01-01");
    expect(p.months).toHaveLength(12);
    expect(p.months[11]).toBe("2025-12-01");
    expect(p.label).toBe("2025");
  });

  it("accepts surrounding spaces", () => {
    expect(reportPeriod("year", " 2025 ").start).toBe("2025-01-01");
  });

  it.each([
    ["month", "2026-13"],
    ["month", "2026-3"],
    ["month", "2026-Q1"],
    ["quarter", "2026-Q5"],
    ["quarter", "2026-03"],
    ["year", "26"],
    ["year", "2026-01"],
    ["month", ""],
  ] as const)("refuses %s %j with a clear message", (kind, anchor) => {
    expect(() => reportPeriod(kind, anchor)).toThrow(/write it like/);
  });

  it("refuses years outside the app's range and unknown kinds", () => {
    expect(() => reportPeriod("year", "1989")).toThrow(/from 1990 to 2100/);
    expect(() => reportPeriod("week" as never, "2026")).toThrow(
      /Unknown period kind/,
    );
  });
});

describe("helpers", () => {
  it("anchorFor names the period that contains a month", () => {
    expect(anchorFor("month", "2026-03")).toBe("2026-03");
    expect(anchorFor("quarter", "2026-03")).toBe("2026-Q1");
    expect(anchorFor("quarter", "2026-10")).toBe("2026-Q4");
    expect(anchorFor("year", "2026-10")).toBe("2026");
  });
});

describe("reportPeriodFields", () => {
  it("parses the form into a period", () => {
    const result = reportPeriodFields.safeParse({
      kind: "quarter",
      anchor: "2026-Q2",
    });
    expect(result.success && result.data.label).toBe("Q2 2026");
  });

  it("puts a bad anchor on the anchor field", () => {
    const result = reportPeriodFields.safeParse({
      kind: "month",
      anchor: "2026-Q2",
    });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0].path).toEqual(["anchor"]);
  });

  it("refuses an unknown kind", () => {
    const result = reportPeriodFields.safeParse({
      kind: "week",
      anchor: "2026",
    });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0].path).toEqual(["kind"]);
  });
});

describe("financial periods in reports", () => {
  it("a financial year starting in April runs April to March", () => {
    const fy = reportPeriod("financial_year", "2025", 4);
    expect(fy.start).toBe("2025-04-01");
    expect(fy.end).toBe("2026-04-01");
    expect(fy.months).toHaveLength(12);
    expect(fy.label).toBe("FY 2025/26");
  });

  it("its fourth quarter crosses the calendar year", () => {
    const q4 = reportPeriod("financial_quarter", "2025-Q4", 4);
    expect(q4.months).toEqual(["2026-01-01", "2026-02-01", "2026-03-01"]);
    expect(q4.end).toBe("2026-04-01");
    expect(q4.label).toBe("Q4 FY 2025/26");
    expect(anchorFor("financial_quarter", "2026-02", 4)).toBe("2025-Q4");
    expect(anchorFor("financial_year", "2026-03", 4)).toBe("2025");
    expect(anchorFor("financial_year", "2026-04", 4)).toBe("2026");
  });
});
