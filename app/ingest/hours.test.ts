import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  HOUR_MS,
  addHours,
  floorToHour,
  intervalStartsBetween,
  hoursBetween,
  nextFloat,
  splitAcrossIntervals,
  sumByInterval,
  ulp,
} from "./hours";

// All check values below are arithmetic on the stated definitions (pro rata
// by time over UTC hours); none comes from an outside source.

const t = (iso: string) => new Date(iso);

function sumInOrder(pieces: { energyKwh: number }[]): number {
  return pieces.reduce((s, p) => s + p.energyKwh, 0);
}

describe("floorToHour and hoursBetween", () => {
  it("floors to the UTC hour", () => {
    expect(floorToHour(t("2026-03-29T01:59:59.999Z"))).toEqual(
      t("2026-03-29T01:00:00Z"),
    );
    expect(floorToHour(t("2026-03-29T02:00:00Z"))).toEqual(
      t("2026-03-29T02:00:00Z"),
    );
  });

  it("floors instants before 1970 down, not towards zero", () => {
    expect(floorToHour(t("1969-12-31T23:30:00Z"))).toEqual(
      t("1969-12-31T23:00:00Z"),
    );
  });

  it("counts hours, fractional and signed", () => {
    const a = t("2026-01-01T00:00:00Z");
    expect(hoursBetween(a, t("2026-01-02T00:00:00Z"))).toBe(24);
    expect(hoursBetween(a, t("2026-01-01T00:30:00Z"))).toBe(0.5);
    expect(hoursBetween(t("2026-01-01T02:00:00Z"), a)).toBe(-2);
  });

  it("lists the hour starts overlapping [from, to)", () => {
    const hours = intervalStartsBetween(
      t("2026-01-01T00:30:00Z"),
      t("2026-01-01T03:00:00Z"),
    );
    expect(hours.map((h) => h.toISOString())).toEqual([
      "2026-01-01T00:00:00.000Z",
      "2026-01-01T01:00:00.000Z",
      "2026-01-01T02:00:00.000Z",
    ]);
    expect(addHours(hours[0], 2)).toEqual(hours[2]);
  });
});

describe("splitAcrossIntervals", () => {
  it("gives a reading inside one hour wholly to that hour", () => {
    const pieces = splitAcrossIntervals(
      t("2026-01-01T10:05:00Z"),
      t("2026-01-01T10:20:00Z"),
      3.7,
    );
    expect(pieces).toEqual([
      { intervalStart: t("2026-01-01T10:00:00Z"), energyKwh: 3.7 },
    ]);
  });

  it("keeps an hourly reading in its own hour (end on the boundary)", () => {
    const pieces = splitAcrossIntervals(
      t("2026-01-01T10:00:00Z"),
      t("2026-01-01T11:00:00Z"),
      5,
    );
    expect(pieces).toHaveLength(1);
  });

  it("splits pro rata by time: 90 min of 30 kWh → 10 + 20", () => {
    // 10:30–12:00 = 90 min: 30 min in hour 10 (1/3), 60 min in hour 11.
    const pieces = splitAcrossIntervals(
      t("2026-01-01T10:30:00Z"),
      t("2026-01-01T12:00:00Z"),
      30,
    );
    expect(pieces.map((p) => p.intervalStart.toISOString())).toEqual([
      "2026-01-01T10:00:00.000Z",
      "2026-01-01T11:00:00.000Z",
    ]);
    expect(pieces[0].energyKwh).toBeCloseTo(10, 12);
    expect(pieces[1].energyKwh).toBeCloseTo(20, 12);
  });

  it("splits negative energy (chilled water) with the same sign", () => {
    const pieces = splitAcrossIntervals(
      t("2026-07-01T00:00:00Z"),
      t("2026-07-01T04:00:00Z"),
      -8,
    );
    expect(pieces.map((p) => p.energyKwh)).toEqual([-2, -2, -2, -2]);
  });

  it("adds up exactly where a plain remainder would miss by one ulp", () => {
    // 7347.29 kWh over 00:30–01:54: 30/84 and 54/84 of it. Found by search:
    // the unsnapped pieces 2624.032142857143 + (7347.29 − that) add up to
    // 7347.290000000001 in floating point.
    const pieces = splitAcrossIntervals(
      t("2026-01-01T00:30:00Z"),
      t("2026-01-01T01:54:00Z"),
      7347.29,
    );
    expect(pieces[0].energyKwh).toBeCloseTo((7347.29 * 30) / 84, 9);
    expect(sumInOrder(pieces)).toBe(7347.29);
  });

  it("throws on a zero-length or reversed reading", () => {
    const a = t("2026-01-01T10:00:00Z");
    expect(() => splitAcrossIntervals(a, a, 1)).toThrow(RangeError);
    expect(() => splitAcrossIntervals(addHours(a, 1), a, 1)).toThrow(/after/);
  });

  it("throws on a non-finite energy", () => {
    const a = t("2026-01-01T10:00:00Z");
    expect(() => splitAcrossIntervals(a, addHours(a, 1), NaN)).toThrow(
      RangeError,
    );
  });

  it("property: the pieces, added in order, equal the input exactly", () => {
    const base = t("2026-01-01T00:00:00Z").getTime();
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 48 * HOUR_MS }),
        fc.integer({ min: 1, max: 72 * HOUR_MS }),
        // Meter-like values (two decimals) as well as arbitrary doubles.
        fc.oneof(
          fc.integer({ min: -1e9, max: 1e9 }).map((c) => c / 100),
          fc.double({ min: -1e7, max: 1e7, noNaN: true }),
        ),
        (offset, length, energy) => {
          const start = new Date(base + offset);
          const end = new Date(base + offset + length);
          const pieces = splitAcrossIntervals(start, end, energy);
          // + 0 folds −0 into 0: the sum of pieces starts from +0.
          expect(sumInOrder(pieces) + 0).toBe(energy + 0);
          // One piece per overlapped hour, consecutive, none outside.
          expect(pieces[0].intervalStart).toEqual(floorToHour(start));
          for (let i = 1; i < pieces.length; i++) {
            expect(
              hoursBetween(
                pieces[i - 1].intervalStart,
                pieces[i].intervalStart,
              ),
            ).toBe(1);
          }
          expect(pieces.at(-1)!.intervalStart.getTime()).toBeLessThan(
            end.getTime(),
          );
        },
      ),
      { numRuns: 2000 },
    );
  });

  it("property: every piece has the sign of the input", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 30 * HOUR_MS }),
        fc.double({ min: 0.001, max: 1e6, noNaN: true }),
        (length, energy) => {
          const start = t("2026-05-05T05:17:00Z");
          const end = new Date(start.getTime() + length);
          for (const p of splitAcrossIntervals(start, end, energy)) {
            expect(p.energyKwh).toBeGreaterThanOrEqual(0);
          }
        },
      ),
    );
  });
});

describe("nextFloat", () => {
  it("steps to the adjacent double either way, for either sign", () => {
    expect(nextFloat(1, 1)).toBe(1 + Number.EPSILON);
    expect(nextFloat(1, -1)).toBe(1 - Number.EPSILON / 2);
    expect(nextFloat(-1, -1)).toBe(-1 - Number.EPSILON);
    expect(nextFloat(-1, 1)).toBe(-1 + Number.EPSILON / 2);
    expect(nextFloat(0, 1)).toBe(Number.MIN_VALUE);
  });

  it("ulp is the double spacing: 2^-52 at 1, 2^-51 at 3", () => {
    // IEEE 754 binary64 has a 52-bit fraction (common knowledge).
    expect(ulp(1)).toBe(2 ** -52);
    expect(ulp(-3)).toBe(2 ** -51);
    expect(ulp(0)).toBe(Number.MIN_VALUE);
  });
});

describe("sumByInterval", () => {
  it("adds pieces of the same hour and sorts by hour", () => {
    const h1 = t("2026-01-01T01:00:00Z");
    const h0 = t("2026-01-01T00:00:00Z");
    expect(
      sumByInterval([
        { intervalStart: h1, energyKwh: 1 },
        { intervalStart: h0, energyKwh: 2 },
        { intervalStart: h1, energyKwh: 3 },
      ]),
    ).toEqual([
      { intervalStart: h0, energyKwh: 2 },
      { intervalStart: h1, energyKwh: 4 },
    ]);
  });
});
