import { describe, expect, it } from "vitest";
import { addKwh, hourlyTotals } from "./hourly-totals";
import type { Interval } from "./use-intervals";

const half = (
  start: string,
  energy_kwh: string,
  quality: Interval["quality"] = "measured",
  flags: string[] = [],
): Interval => ({
  start,
  end: new Date(Date.parse(start) + 30 * 60_000).toISOString(),
  energy_kwh,
  quality,
  flags,
  estimate_method: null,
  source_count: 1,
});

describe("hourlyTotals: half-hours as the charts' hours", () => {
  it("sums each hour's half-hours exactly and keeps the worst quality", () => {
    const hours = hourlyTotals([
      half("2026-06-10T00:00:00Z", "0.100000"),
      half("2026-06-10T00:30:00Z", "0.200000", "estimated"),
      half("2026-06-10T01:00:00Z", "1.250000", "measured", ["spike"]),
      half("2026-06-10T01:30:00Z", "0.750000", "edited"),
    ]);
    expect(
      hours.map((h) => [h.start, h.end, h.energy_kwh, h.quality, h.flags]),
    ).toEqual([
      [
        "2026-06-10T00:00:00Z",
        "2026-06-10T01:00:00Z",
        "0.300000",
        "estimated",
        [],
      ],
      [
        "2026-06-10T01:00:00Z",
        "2026-06-10T02:00:00Z",
        "2.000000",
        "edited",
        ["spike"],
      ],
    ]);
  });

  it("adds signed six-place decimals without binary rounding", () => {
    expect(addKwh("-0.100000", "0.300000")).toBe("0.200000");
    expect(addKwh("-1.500000", "0.250000")).toBe("-1.250000");
    expect(addKwh("123456789.999999", "0.000001")).toBe("123456790.000000");
  });
});
