import { describe, expect, it } from "vitest";
import { MAX_WEATHER_ROWS, parseWeatherCsv } from "./weather-csv";

describe("weather files", () => {
  it("reads date,mean_temp_c rows, rounding to hundredths", () => {
    const parsed = parseWeatherCsv(
      "\uFEFFdate,mean_temp_c\n2026-01-01,-3.5\n2026-01-02, 12.256 \n\n2026-01-03,+4\n",
    );
    expect(parsed).toEqual({
      ok: true,
      rows: [
        { day: "2026-01-01", meanTempC: -3.5 },
        { day: "2026-01-02", meanTempC: 12.26 },
        { day: "2026-01-03", meanTempC: 4 },
      ],
    });
  });

  it("accepts the columns in any order and case", () => {
    const parsed = parseWeatherCsv("Mean_Temp_C,Date\n7.1,2025-12-31\n");
    expect(parsed).toEqual({
      ok: true,
      rows: [{ day: "2025-12-31", meanTempC: 7.1 }],
    });
  });

  it("names every bad row: impossible dates, non-numbers, out of range, repeats", () => {
    const parsed = parseWeatherCsv(
      [
        "date,mean_temp_c",
        "2026-02-29,1",
        "2026-02-28,warm",
        "2026-02-27,1e1",
        "2026-02-26,75",
        "26/02/2026,3",
        "2026-02-25,",
        "2026-02-24,4",
        "2026-02-24,5",
      ].join("\n"),
    );
    if (parsed.ok) throw new Error("expected problems");
    expect(parsed.problemCount).toBe(7);
    expect(parsed.problems.map((p) => p.row)).toEqual([2, 3, 4, 5, 6, 7, 9]);
    expect(parsed.problems[0].message).toMatch(/^date:/);
    expect(parsed.problems[1].message).toMatch(
      /^mean_temp_c: must be a number/,
    );
    expect(parsed.problems[2].message).toMatch(
      /^mean_temp_c: must be a number/,
    );
    expect(parsed.problems[3].message).toMatch(/from -90 to 60/);
    expect(parsed.problems[5].message).toMatch(/^mean_temp_c: missing/);
    expect(parsed.problems[6].message).toBe(
      "date: 2026-02-24 is already on row 8",
    );
  });

  it("refuses a file without the columns, without rows, or with too many", () => {
    const noColumn = parseWeatherCsv("day,temp\n2026-01-01,3\n");
    expect(noColumn.ok).toBe(false);
    if (!noColumn.ok) expect(noColumn.file).toMatch(/no date or mean_temp_c/);
    const empty = parseWeatherCsv("date,mean_temp_c\n");
    if (empty.ok) throw new Error("expected a problem");
    expect(empty.file).toMatch(/no rows/);
    const rows = Array.from(
      { length: MAX_WEATHER_ROWS + 1 },
      (_, i) =>
        `${new Date(Date.UTC(1990, 0, 1 + i)).toISOString().slice(0, 10)},1`,
    );
    const big = parseWeatherCsv(["date,mean_temp_c", ...rows].join("\n"));
    if (big.ok) throw new Error("expected a problem");
    expect(big.file).toMatch(/at most/);
  });

  it("refuses rows with cells beyond the header", () => {
    const parsed = parseWeatherCsv("date,mean_temp_c\n2026-01-01,3,9\n");
    expect(parsed.ok).toBe(false);
  });
});
