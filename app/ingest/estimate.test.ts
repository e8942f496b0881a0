import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { estimateGaps, interpolate } from "./estimate";
import { HOUR_MS } from "./hours";
import type { IntervalPoint, Quality } from "./series";

// Check values are arithmetic on the definitions in estimate.ts: straight
// lines between the neighbouring known hours, and the mean per weekday ×
// local hour over the weeks before the gap. Dates: 2026-01-05 is a Monday.

const MONDAY = Date.UTC(2026, 0, 5);
const at = (h: number) => new Date(MONDAY + h * HOUR_MS);

function series(values: (number | null)[], quality: Quality = "measured") {
  const out: IntervalPoint[] = [];
  values.forEach((v, h) => {
    if (v !== null) out.push({ intervalStart: at(h), energyKwh: v, quality });
  });
  return out;
}

describe("interpolate", () => {
  it("steps evenly: 10 → 20 over 4 missing hours is 12, 14, 16, 18", () => {
    expect([1, 2, 3, 4].map((k) => interpolate(10, 20, k, 4))).toEqual([
      12, 14, 16, 18,
    ]);
  });
});

describe("estimateGaps: short gaps", () => {
  it("fills a short gap linearly between its neighbours", () => {
    const e = estimateGaps(series([10, null, null, 16]));
    expect(e).toEqual([
      { intervalStart: at(1), energyKwh: 12, method: "linear" },
      { intervalStart: at(2), energyKwh: 14, method: "linear" },
    ]);
  });

  it("treats hours marked missing like absent hours", () => {
    const s: IntervalPoint[] = [
      { intervalStart: at(0), energyKwh: 1, quality: "measured" },
      { intervalStart: at(1), energyKwh: 0, quality: "missing" },
      { intervalStart: at(2), energyKwh: 3, quality: "measured" },
    ];
    expect(estimateGaps(s)).toEqual([
      { intervalStart: at(1), energyKwh: 2, method: "linear" },
    ]);
  });

  it("re-estimates old estimates, never measured or edited hours", () => {
    const s: IntervalPoint[] = [
      { intervalStart: at(0), energyKwh: 1, quality: "measured" },
      { intervalStart: at(1), energyKwh: 99, quality: "estimated" },
      { intervalStart: at(2), energyKwh: 5, quality: "edited" },
      { intervalStart: at(3), energyKwh: 0, quality: "missing" },
      { intervalStart: at(4), energyKwh: 7, quality: "measured" },
    ];
    expect(estimateGaps(s)).toEqual([
      { intervalStart: at(1), energyKwh: 3, method: "linear" },
      { intervalStart: at(3), energyKwh: 6, method: "linear" },
    ]);
  });

  it("leaves hours before the first and after the last known hour", () => {
    const s: IntervalPoint[] = [
      { intervalStart: at(0), energyKwh: 0, quality: "missing" },
      ...series([null, 4, null, 6]),
      { intervalStart: at(4), energyKwh: 0, quality: "missing" },
    ];
    expect(estimateGaps(s).map((e) => e.intervalStart)).toEqual([at(2)]);
  });

  it("accepts the series in any order", () => {
    const s = series([10, null, null, 16]).reverse();
    expect(estimateGaps(s).map((e) => e.energyKwh)).toEqual([12, 14]);
  });
});

// Four weeks of a plain office shape: 10 kWh in hours 8–17 on weekdays,
// 1 kWh otherwise; then the weekdays of week 5 missing (a 5-day gap).
function officeValue(h: number): number {
  const dayOfWeek = Math.floor(h / 24) % 7; // 0 = Monday
  const hour = h % 24;
  return dayOfWeek < 5 && hour >= 8 && hour < 18 ? 10 : 1;
}

describe("estimateGaps: long gaps", () => {
  it("fills a long gap from the weekday × hour profile", () => {
    const hours = 5 * 168;
    const values = Array.from({ length: hours }, (_, h) =>
      h > 4 * 168 && h < 4 * 168 + 120 ? null : officeValue(h),
    );
    const e = estimateGaps(series(values));
    expect(e).toHaveLength(119);
    expect(e.every((x) => x.method === "profile")).toBe(true);
    for (const x of e) {
      const h = (x.intervalStart.getTime() - MONDAY) / HOUR_MS;
      expect(x.energyKwh).toBe(officeValue(h));
    }
  });

  it("uses only the profile weeks before the gap", () => {
    // Weeks 0–1 at 5 kWh, weeks 2–3 at 2 kWh, a gap early in week 4, then
    // data again at 50 kWh. With profileWeeks 2 the profile is 2 kWh.
    const values: (number | null)[] = [];
    for (let h = 0; h < 5 * 168; h++) {
      if (h < 2 * 168) values.push(5);
      else if (h < 4 * 168) values.push(2);
      else if (h < 4 * 168 + 30) values.push(null);
      else values.push(50);
    }
    values[4 * 168] = 2; // the known hour before the gap
    const e = estimateGaps(series(values), { profileWeeks: 2 });
    expect(e).toHaveLength(29);
    expect(e.every((x) => x.energyKwh === 2 && x.method === "profile")).toBe(
      true,
    );
  });

  it("falls back to all the data when the recent weeks lack the slot", () => {
    // Only Monday 09:00 of week 0 is known before the gap; week 5 has data.
    const s = [
      { intervalStart: at(9), energyKwh: 7, quality: "measured" as const },
      {
        intervalStart: at(3 * 168 + 8),
        energyKwh: 1,
        quality: "measured" as const,
      },
      {
        intervalStart: at(5 * 168 + 9),
        energyKwh: 9,
        quality: "measured" as const,
      },
      {
        intervalStart: at(5 * 168 + 10),
        energyKwh: 1,
        quality: "measured" as const,
      },
    ];
    const e = estimateGaps(s, { profileWeeks: 1 });
    // Monday 09:00 of week 4 falls in the long gap between hours 3·168+8 and
    // 5·168+9: no Monday 09:00 in the week before, so all data: (7 + 9) / 2.
    const monday9 = e.find(
      (x) => x.intervalStart.getTime() === at(4 * 168 + 9).getTime(),
    );
    expect(monday9).toEqual({
      intervalStart: at(4 * 168 + 9),
      energyKwh: 8,
      method: "profile",
    });
    // A slot never seen anywhere falls back to the straight line.
    const other = e.find(
      (x) => x.intervalStart.getTime() === at(4 * 168 + 11).getTime(),
    );
    expect(other?.method).toBe("linear");
  });

  it("follows local time: a London profile shifts by an hour in summer", () => {
    // Two weeks in July where 10 kWh flows at 09:00 London time (08:00 UTC),
    // then a 30-hour gap: the estimate is 10 at 08:00 UTC, not 09:00 UTC.
    const start = Date.UTC(2026, 6, 6); // Monday 6 July 2026
    const s: IntervalPoint[] = [];
    for (let h = 0; h < 3 * 168; h++) {
      if (h > 2 * 168 && h < 2 * 168 + 31) continue;
      const t = new Date(start + h * HOUR_MS);
      const v = t.getUTCHours() === 8 ? 10 : 1;
      s.push({ intervalStart: t, energyKwh: v, quality: "measured" });
    }
    const e = estimateGaps(s, { timeZone: "Europe/London" });
    const eight = e.find((x) => x.intervalStart.getUTCHours() === 8);
    const nine = e.find((x) => x.intervalStart.getUTCHours() === 9);
    expect(eight?.energyKwh).toBe(10);
    expect(nine?.energyKwh).toBe(1);
  });

  it("uses the straight line for long gaps when shortGapMaxHours says so", () => {
    const e = estimateGaps(series([0, ...Array(9).fill(null), 10]), {
      shortGapMaxHours: 10,
    });
    expect(e.map((x) => x.energyKwh)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
  });

  it("rejects nonsensical options", () => {
    expect(() => estimateGaps([], { profileWeeks: 0 })).toThrow(RangeError);
    expect(() => estimateGaps([], { shortGapMaxHours: -1 })).toThrow(
      RangeError,
    );
  });
});

const cell = fc.record({
  value: fc.double({ min: -500, max: 500, noNaN: true }),
  quality: fc.constantFrom<Quality | "absent">(
    "measured",
    "measured",
    "edited",
    "estimated",
    "missing",
    "absent",
  ),
});

function seriesOf(cells: { value: number; quality: Quality | "absent" }[]) {
  const out: IntervalPoint[] = [];
  cells.forEach((c, h) => {
    if (c.quality !== "absent") {
      out.push({
        intervalStart: at(h),
        energyKwh: c.value,
        quality: c.quality,
      });
    }
  });
  return out;
}

describe("estimateGaps: properties", () => {
  it("estimates exactly the unknown hours between the first and last known", () => {
    fc.assert(
      fc.property(
        fc.array(cell, { maxLength: 400 }),
        fc.integer({ min: 0, max: 12 }),
        (cells, shortGapMaxHours) => {
          const known = cells
            .map((c, h) =>
              c.quality === "measured" || c.quality === "edited" ? h : -1,
            )
            .filter((h) => h >= 0);
          const e = estimateGaps(seriesOf(cells), { shortGapMaxHours });
          const got = e.map(
            (x) => (x.intervalStart.getTime() - MONDAY) / HOUR_MS,
          );
          const expected: number[] = [];
          if (known.length > 0) {
            const knownSet = new Set(known);
            for (let h = known[0] + 1; h < known.at(-1)!; h++) {
              if (!knownSet.has(h)) expected.push(h);
            }
          }
          expect(got).toEqual(expected);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("linear estimates lie between their neighbours", () => {
    fc.assert(
      fc.property(fc.array(cell, { maxLength: 200 }), (cells) => {
        const s = seriesOf(cells);
        const knownAt = new Map<number, number>();
        for (const p of s) {
          if (p.quality === "measured" || p.quality === "edited") {
            knownAt.set(
              (p.intervalStart.getTime() - MONDAY) / HOUR_MS,
              p.energyKwh,
            );
          }
        }
        const e = estimateGaps(s, { shortGapMaxHours: 1000 });
        for (const x of e) {
          const h = (x.intervalStart.getTime() - MONDAY) / HOUR_MS;
          let lo = h - 1;
          while (!knownAt.has(lo)) lo--;
          let hi = h + 1;
          while (!knownAt.has(hi)) hi++;
          const a = knownAt.get(lo)!;
          const b = knownAt.get(hi)!;
          expect(x.method).toBe("linear");
          expect(x.energyKwh).toBeGreaterThanOrEqual(Math.min(a, b) - 1e-9);
          expect(x.energyKwh).toBeLessThanOrEqual(Math.max(a, b) + 1e-9);
        }
      }),
      { numRuns: 300 },
    );
  });
});
