import { describe, expect, it } from "vitest";
import type { IntervalPoint, Quality } from "./series";
import {
  detectNegative,
  detectSpikes,
  findGaps,
  typicalIntervalValue,
} from "./validate";

// Check values are arithmetic on the definitions in validate.ts (median of
// |value| over non-zero measured hours; factor × median; sign; runs of hours
// without a known value).

const at = (h: number) => new Date(Date.UTC(2026, 0, 1, h));

function series(values: (number | null)[], quality: Quality = "measured") {
  const out: IntervalPoint[] = [];
  values.forEach((v, h) => {
    if (v !== null) out.push({ intervalStart: at(h), energyKwh: v, quality });
  });
  return out;
}

describe("typicalIntervalValue", () => {
  it("is the median of |measured|, zeros left out", () => {
    // |−4|, 2, 6, 8 → sorted 2, 4, 6, 8 → median (4 + 6) / 2 = 5.
    expect(typicalIntervalValue(series([0, -4, 2, 0, 6, 8]))).toBe(5);
    expect(typicalIntervalValue(series([3, 1, 2]))).toBe(2);
  });

  it("ignores estimated and edited hours, and is null with no data", () => {
    const s = [
      ...series([10]),
      { intervalStart: at(1), energyKwh: 1000, quality: "estimated" as const },
      { intervalStart: at(2), energyKwh: 1000, quality: "edited" as const },
    ];
    expect(typicalIntervalValue(s)).toBe(10);
    expect(typicalIntervalValue(series([0, 0]))).toBeNull();
    expect(typicalIntervalValue([])).toBeNull();
  });
});

describe("detectSpikes", () => {
  it("flags |value| above factor × typical (default 10)", () => {
    // Sorted 4 5 5 6 51 60 → median (5 + 6) / 2 = 5.5.
    const s = series([4, 5, 5, 6, 60, 51]);
    expect(typicalIntervalValue(s)).toBe(5.5);
    // Limit 55: only 60 is above it.
    expect(detectSpikes(s).map((p) => p.energyKwh)).toEqual([60]);
    // Factor 5 → limit 27.5: 60 and 51.
    expect(detectSpikes(s, 5).map((p) => p.energyKwh)).toEqual([60, 51]);
  });

  it("flags negative spikes by magnitude", () => {
    const s = series([-3, -3, -3, -300]);
    expect(detectSpikes(s).map((p) => p.energyKwh)).toEqual([-300]);
  });

  it("checks only measured hours", () => {
    const s = [
      ...series([3, 3, 3]),
      { intervalStart: at(5), energyKwh: 999, quality: "edited" as const },
    ];
    expect(detectSpikes(s)).toEqual([]);
  });

  it("also checks hours that share out a register's advance across a gap", () => {
    // A register read 10,000 units too high, spread over a 4-hour gap:
    // each spread hour is far above 10 × the typical 3 kWh.
    const spread = (h: number, kwh: number): IntervalPoint => ({
      intervalStart: at(h),
      energyKwh: kwh,
      quality: "estimated",
      registerSpread: true,
    });
    const s = [...series([3, 3, 3]), spread(3, 2500), spread(4, 2500)];
    expect(detectSpikes(s).map((p) => p.intervalStart)).toEqual([at(3), at(4)]);
    // A plausible spread is not a spike; profile estimates are never checked.
    expect(detectSpikes([...series([3, 3, 3]), spread(3, 4)])).toEqual([]);
    const profiled = { ...spread(3, 2500), registerSpread: false };
    expect(detectSpikes([...series([3, 3, 3]), profiled])).toEqual([]);
  });

  it("rejects a factor that is not positive", () => {
    expect(() => detectSpikes(series([1]), 0)).toThrow(RangeError);
  });
});

describe("detectNegative", () => {
  it("flags measured values against the expected sign", () => {
    const s = series([2, -1, 0, 3]);
    expect(detectNegative(s).map((p) => p.energyKwh)).toEqual([-1]);
    // Chilled water: values should be ≤ 0; the positive ones are wrong.
    expect(detectNegative(s, -1).map((p) => p.energyKwh)).toEqual([2, 3]);
  });

  it("leaves estimated hours alone", () => {
    expect(detectNegative(series([-5], "estimated"))).toEqual([]);
  });
});

describe("findGaps", () => {
  it("finds runs of hours without a known value", () => {
    // Hours 0..9: known at 0, 1, 4, 9 → gaps 2–3 (2 h) and 5–8 (4 h).
    const s = series([1, 1, null, null, 1, null, null, null, null, 1]);
    expect(findGaps(s, at(0), at(10))).toEqual([
      { start: at(2), hours: 2, edge: null },
      { start: at(5), hours: 4, edge: null },
    ]);
  });

  it("marks gaps at the edges of the window", () => {
    const s = series([null, null, 1, 1, null]);
    expect(findGaps(s, at(0), at(6))).toEqual([
      { start: at(0), hours: 2, edge: "leading" },
      { start: at(4), hours: 2, edge: "trailing" },
    ]);
  });

  it("counts missing and estimated hours as gaps, edited as data", () => {
    const s: IntervalPoint[] = [
      { intervalStart: at(0), energyKwh: 1, quality: "measured" },
      { intervalStart: at(1), energyKwh: 0, quality: "missing" },
      { intervalStart: at(2), energyKwh: 1, quality: "estimated" },
      { intervalStart: at(3), energyKwh: 1, quality: "edited" },
    ];
    expect(findGaps(s, at(0), at(4))).toEqual([
      { start: at(1), hours: 2, edge: null },
    ]);
  });

  it("reports a window with no known hour as one leading gap", () => {
    expect(findGaps([], at(0), at(3))).toEqual([
      { start: at(0), hours: 3, edge: "leading" },
    ]);
  });
});
