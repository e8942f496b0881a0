// Ingest at a meter's own resolution (issue #14): readings cut into 15- and
// 30-minute intervals, gaps estimated in those steps, and a weekly profile
// that follows the site's local half-hours across daylight-saving days.
import { describe, expect, it } from "vitest";
import { estimateGaps } from "./estimate";
import { piecesOf } from "./interval-pieces";
import { localParts } from "./local-time";
import type { PreparedReading } from "./prepare-readings.server";
import type { IntervalPoint } from "./series";
import { findGaps } from "./validate";

const MINUTE_MS = 60_000;
const HALF_HOUR_MS = 30 * MINUTE_MS;
const QUARTER_MS = 15 * MINUTE_MS;

function reading(
  intervalMinutes: number,
  start: string,
  end: string,
  energyKwh: string,
): PreparedReading {
  return {
    index: 0,
    meter: { id: "m1", intervalMinutes } as PreparedReading["meter"],
    readingTime: new Date(start),
    endTime: new Date(end),
    payload: {},
    payloadHash: "",
    energyKwh,
    registerKwh: null,
    uncertaintyKwh: null,
  };
}

const iso = (ms: number) => new Date(ms).toISOString();

describe("interval pieces at the meter's resolution", () => {
  it("cut a two-hour reading into four half-hours of a half-hourly meter", () => {
    const pieces = piecesOf(
      reading(30, "2026-03-02T10:00:00Z", "2026-03-02T12:00:00Z", "8.000000"),
    );
    expect(pieces.map((p) => [iso(p.start), p.energy])).toEqual([
      ["2026-03-02T10:00:00.000Z", "2.000000"],
      ["2026-03-02T10:30:00.000Z", "2.000000"],
      ["2026-03-02T11:00:00.000Z", "2.000000"],
      ["2026-03-02T11:30:00.000Z", "2.000000"],
    ]);
  });

  it("keep a reading of one native interval as it came, text and all", () => {
    const half = piecesOf(
      reading(30, "2026-03-02T10:30:00Z", "2026-03-02T11:00:00Z", "0.123457"),
    );
    expect(half).toEqual([
      {
        start: Date.parse("2026-03-02T10:30:00Z"),
        energy: "0.123457",
        band: "0.000000",
      },
    ]);
    const quarter = piecesOf(
      reading(15, "2026-03-02T10:45:00Z", "2026-03-02T11:00:00Z", "3.000001"),
    );
    expect(quarter.map((p) => [iso(p.start), p.energy])).toEqual([
      ["2026-03-02T10:45:00.000Z", "3.000001"],
    ]);
  });

  it("cut a 45-minute reading into three quarter-hours of a 15-minute meter", () => {
    const pieces = piecesOf(
      reading(15, "2026-03-02T10:15:00Z", "2026-03-02T11:00:00Z", "3.000000"),
    );
    expect(pieces.map((p) => iso(p.start))).toEqual([
      "2026-03-02T10:15:00.000Z",
      "2026-03-02T10:30:00.000Z",
      "2026-03-02T10:45:00.000Z",
    ]);
    expect(pieces.reduce((s, p) => s + Number(p.energy), 0)).toBe(3);
  });

  it("on an hourly meter, still give the hour the whole reading", () => {
    const pieces = piecesOf(
      reading(60, "2026-03-02T10:00:00Z", "2026-03-02T10:30:00Z", "4.000000"),
    );
    expect(pieces.map((p) => [iso(p.start), p.energy])).toEqual([
      ["2026-03-02T10:00:00.000Z", "4.000000"],
    ]);
  });
});

describe("short gaps at 15 and 30 minutes", () => {
  const point = (at: string, energyKwh: number): IntervalPoint => ({
    intervalStart: new Date(at),
    energyKwh,
    quality: "measured",
  });

  it("fill a 15-minute meter's missing hour in quarter-hour steps", () => {
    const estimates = estimateGaps(
      [point("2026-03-02T00:00:00Z", 1), point("2026-03-02T01:00:00Z", 5)],
      { stepMs: QUARTER_MS },
    );
    expect(estimates).toEqual([
      {
        intervalStart: new Date("2026-03-02T00:15:00Z"),
        energyKwh: 2,
        method: "linear",
      },
      {
        intervalStart: new Date("2026-03-02T00:30:00Z"),
        energyKwh: 3,
        method: "linear",
      },
      {
        intervalStart: new Date("2026-03-02T00:45:00Z"),
        energyKwh: 4,
        method: "linear",
      },
    ]);
  });

  it("count a gap's length in hours whatever the step: 6 h is 12 half-hours", () => {
    const gapOf = (halfHours: number) =>
      estimateGaps(
        [
          point("2026-03-02T00:00:00Z", 1),
          point(
            iso(
              Date.parse("2026-03-02T00:00:00Z") +
                (halfHours + 1) * HALF_HOUR_MS,
            ),
            1,
          ),
        ],
        { stepMs: HALF_HOUR_MS, shortGapMaxHours: 6 },
      );
    expect(gapOf(12).every((e) => e.method === "linear")).toBe(true);
    expect(gapOf(12)).toHaveLength(12);
    // Longer: the profile's turn (no history here, so it falls back to the line).
    expect(gapOf(13)).toHaveLength(13);
  });

  it("find gaps as runs of missing half-hours", () => {
    const gaps = findGaps(
      [point("2026-03-02T00:00:00Z", 1), point("2026-03-02T01:30:00Z", 1)],
      new Date("2026-03-02T00:00:00Z"),
      new Date("2026-03-02T02:00:00Z"),
      HALF_HOUR_MS,
    );
    expect(gaps).toEqual([
      { start: new Date("2026-03-02T00:30:00Z"), hours: 1, edge: null },
    ]);
  });
});

/**
 * A half-hourly meter in London whose every half-hour reads its local
 * half-hour of the day plus one (00:00 → 1 … 23:30 → 48), for the eight
 * weeks before `dayStart`; then nothing for the whole local day, and one
 * reading at the next local midnight.
 */
function londonDayGap(dayStart: string, nextDay: string) {
  const zone = "Europe/London";
  const gapStart = Date.parse(dayStart);
  const gapEnd = Date.parse(nextDay);
  const localValue = (t: number) => {
    const p = localParts(new Date(t), zone);
    return p.hour * 2 + p.minute / 30 + 1;
  };
  const series: IntervalPoint[] = [];
  for (let t = gapStart - 8 * 7 * 86_400_000; t < gapStart; t += HALF_HOUR_MS)
    series.push({
      intervalStart: new Date(t),
      energyKwh: localValue(t),
      quality: "measured",
    });
  series.push({
    intervalStart: new Date(gapEnd),
    energyKwh: 1,
    quality: "measured",
  });
  const estimates = estimateGaps(series, {
    stepMs: HALF_HOUR_MS,
    timeZone: zone,
    profileWeeks: 8,
  });
  return { estimates, localValue };
}

describe("a half-hourly meter's long gap over a daylight-saving day (Europe/London)", () => {
  it("fills the spring day's 46 half-hours from the profile of its local half-hours", () => {
    // 29 Mar 2026: clocks go from 01:00 GMT to 02:00 BST.
    const { estimates, localValue } = londonDayGap(
      "2026-03-29T00:00:00Z",
      "2026-03-29T23:00:00Z",
    );
    expect(estimates).toHaveLength(46);
    expect(estimates.every((e) => e.method === "profile")).toBe(true);
    const values = estimates.map((e) => e.energyKwh);
    expect(values).toEqual(
      estimates.map((e) => localValue(e.intervalStart.getTime())),
    );
    // Local 01:00 and 01:30 (values 3 and 4) never happen that day.
    expect(values.slice(0, 4)).toEqual([1, 2, 5, 6]);
  });

  it("fills the autumn day's 50 half-hours, local 01:00 and 01:30 twice", () => {
    // 25 Oct 2026: clocks go from 02:00 BST back to 01:00 GMT.
    const { estimates } = londonDayGap(
      "2026-10-24T23:00:00Z",
      "2026-10-26T00:00:00Z",
    );
    expect(estimates).toHaveLength(50);
    expect(estimates.every((e) => e.method === "profile")).toBe(true);
    expect(estimates.slice(0, 7).map((e) => e.energyKwh)).toEqual([
      1, 2, 3, 4, 3, 4, 5,
    ]);
    expect(estimates.at(-1)!.energyKwh).toBe(48);
  });
});
