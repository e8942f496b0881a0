import { describe, expect, it } from "vitest";
import { bandWeek, parseWindow } from "./band-week";

describe("time bands", () => {
  it("day and night with a window past midnight cover the week exactly once", () => {
    const week = bandWeek([
      { name: "Day", windows: "Mon-Sun 07:00-23:00" },
      { name: "Night", windows: "Mon-Sun 23:00-07:00" },
    ]);
    expect(week.ok).toBe(true);
    if (!week.ok) return;
    // Monday 06:45 is night (index 1), 07:00 day (0); Sunday 23:00 night runs into Monday.
    expect(week.value[6 * 4 + 3]).toBe(1);
    expect(week.value[7 * 4]).toBe(0);
    expect(week.value[6 * 96 + 23 * 4]).toBe(1);
  });

  it("refuses a gap and names it", () => {
    const week = bandWeek([
      { name: "Day", windows: "Mon-Fri 07:00-23:00" },
      { name: "Night", windows: "Mon-Sun 23:00-07:00" },
    ]);
    expect(week).toEqual({
      ok: false,
      reason: expect.stringContaining("no band for Sat 07:00 to Sat 23:00"),
    });
  });

  it("refuses an overlap and names the bands", () => {
    const week = bandWeek([
      { name: "Day", windows: "Mon-Sun 00:00-24:00" },
      { name: "Peak", windows: "Mon-Fri 16:00-19:00" },
    ]);
    expect(week.ok).toBe(false);
    if (week.ok) return;
    expect(week.reason).toContain("overlap (Day, Peak)");
    expect(week.reason).toContain("Mon 16:00 to Mon 19:00");
  });

  it("reads windows and refuses times off the quarter hour", () => {
    expect(parseWindow("Sat 09:00-12:00")).toEqual({
      ok: true,
      value: { days: [5], fromQuarter: 36, toQuarter: 48 },
    });
    expect(parseWindow("Fri-Mon 00:00-24:00").ok).toBe(true);
    expect(parseWindow("Mon-Fri 07:10-23:00").ok).toBe(false);
    expect(parseWindow("Funday 07:00-23:00").ok).toBe(false);
  });
});
