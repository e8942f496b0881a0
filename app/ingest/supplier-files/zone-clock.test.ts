import { describe, expect, it } from "vitest";
import {
  ZoneClock,
  isValidTimeZone,
  offsetMinutesAt,
  resolveWall,
} from "./zone-clock";

// Check values: UK civil time is GMT in winter and BST (UTC+1) from 01:00 UTC
// on the last Sunday of March to 01:00 UTC on the last Sunday of October
// (the Summer Time Order 2002; common knowledge). In 2026 those Sundays are
// 29 March and 25 October, read off the calendar. New York (US Energy Policy
// Act 2005 rules): EDT from 2 a.m. on the second Sunday of March, 8 March 2026.

const LONDON = "Europe/London";
const wall = (text: string) => Date.parse(`${text}Z`);
const iso = (ms: number) => new Date(ms).toISOString();

describe("offsetMinutesAt", () => {
  it("is 0 in GMT and 60 in BST, changing at 01:00 UTC on 29 March 2026", () => {
    expect(offsetMinutesAt(Date.parse("2026-01-15T12:00:00Z"), LONDON)).toBe(0);
    expect(offsetMinutesAt(Date.parse("2026-03-29T00:59:59Z"), LONDON)).toBe(0);
    expect(offsetMinutesAt(Date.parse("2026-03-29T01:00:00Z"), LONDON)).toBe(
      60,
    );
    expect(offsetMinutesAt(Date.parse("2026-10-25T00:59:59Z"), LONDON)).toBe(
      60,
    );
    expect(offsetMinutesAt(Date.parse("2026-10-25T01:00:00Z"), LONDON)).toBe(0);
  });

  it("reads zones west of UTC as negative (New York EST −5 h)", () => {
    expect(
      offsetMinutesAt(Date.parse("2026-01-15T12:00:00Z"), "America/New_York"),
    ).toBe(-300);
  });
});

describe("resolveWall", () => {
  it("gives one instant for an ordinary time: 12:00 BST on 1 July 2026 is 11:00 UTC", () => {
    const r = resolveWall(wall("2026-07-01T12:00:00"), LONDON);
    expect(r).toEqual({
      kind: "unique",
      instant: Date.parse("2026-07-01T11:00:00Z"),
    });
  });

  it("finds no instant for 01:30 on 29 March 2026: the clocks jump from 01:00 to 02:00", () => {
    expect(resolveWall(wall("2026-03-29T01:30:00"), LONDON)).toEqual({
      kind: "skipped",
      gapMinutes: 60,
    });
    expect(resolveWall(wall("2026-03-29T01:00:00"), LONDON).kind).toBe(
      "skipped",
    );
    expect(resolveWall(wall("2026-03-29T02:00:00"), LONDON)).toEqual({
      kind: "unique",
      instant: Date.parse("2026-03-29T01:00:00Z"),
    });
  });

  it("finds two instants for 01:30 on 25 October 2026: BST (00:30 UTC) then GMT (01:30 UTC)", () => {
    const r = resolveWall(wall("2026-10-25T01:30:00"), LONDON);
    expect(r.kind).toBe("repeated");
    if (r.kind !== "repeated") return;
    expect([iso(r.earlier), iso(r.later)]).toEqual([
      "2026-10-25T00:30:00.000Z",
      "2026-10-25T01:30:00.000Z",
    ]);
  });

  it("knows another zone's rules: 02:30 on 8 March 2026 does not exist in New York", () => {
    expect(
      resolveWall(wall("2026-03-08T02:30:00"), "America/New_York").kind,
    ).toBe("skipped");
  });
});

describe("ZoneClock", () => {
  const clock = new ZoneClock(LONDON);

  it("makes 29 March 2026 23 hours long and 25 October 2026 25 hours long", () => {
    const spring = clock.day(2026, 3, 29);
    expect([iso(spring.start), iso(spring.end), spring.steady]).toEqual([
      "2026-03-29T00:00:00.000Z",
      "2026-03-29T23:00:00.000Z",
      false,
    ]);
    const autumn = clock.day(2026, 10, 25);
    expect([iso(autumn.start), iso(autumn.end)]).toEqual([
      "2026-10-24T23:00:00.000Z",
      "2026-10-26T00:00:00.000Z",
    ]);
    expect((autumn.end - autumn.start) / 3_600_000).toBe(25);
  });

  it("takes a summer day's offset from the cache: 1 July 2026 00:00 BST is 30 June 23:00 UTC", () => {
    const day = clock.day(2026, 7, 1);
    expect([iso(day.start), day.steady, day.offsetMinutes]).toEqual([
      "2026-06-30T23:00:00.000Z",
      true,
      60,
    ]);
    expect(clock.resolve(wall("2026-07-01T13:30:00"))).toEqual({
      kind: "unique",
      instant: Date.parse("2026-07-01T12:30:00Z"),
    });
  });

  it("falls back to the full rule on a clock-change day", () => {
    expect(clock.resolve(wall("2026-03-29T01:30:00")).kind).toBe("skipped");
    expect(clock.resolve(wall("2026-10-25T01:00:00")).kind).toBe("repeated");
    expect(clock.resolve(wall("2026-10-25T03:00:00"))).toEqual({
      kind: "unique",
      instant: Date.parse("2026-10-25T03:00:00Z"),
    });
  });

  it("starts a day whose midnight is skipped at the end of the gap (Santiago, 6 Sep 2026: 00:00 → 01:00)", () => {
    // Chile's summer time begins at 24:00 on the first Saturday of September
    // (tz database, America/Santiago): 6 September 2026 has no 00:00.
    const santiago = new ZoneClock("America/Santiago");
    const day = santiago.day(2026, 9, 6);
    expect(iso(day.start)).toBe("2026-09-06T04:00:00.000Z");
    expect((day.end - day.start) / 3_600_000).toBe(23);
  });
});

describe("isValidTimeZone", () => {
  it("accepts IANA names and refuses others", () => {
    expect(isValidTimeZone(LONDON)).toBe(true);
    expect(isValidTimeZone("UTC")).toBe(true);
    expect(isValidTimeZone("Mars/Olympus")).toBe(false);
  });
});
