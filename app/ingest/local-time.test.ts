import { describe, expect, it } from "vitest";
import { localParts, weekHourSlot } from "./local-time";

// Check values: UK civil time is GMT in winter and BST (UTC+1) from 01:00 UTC
// on the last Sunday of March to 01:00 UTC on the last Sunday of October
// (the UK Summer Time Order; common knowledge). The 2026 dates, 29 March and
// 25 October, are read off the calendar.

const LONDON = "Europe/London";

describe("localParts", () => {
  it("is GMT in January: 2026-01-05 is a Monday", () => {
    expect(localParts(new Date("2026-01-05T08:00:00Z"), LONDON)).toEqual({
      year: 2026,
      month: 1,
      day: 5,
      weekday: 1,
      hour: 8,
      minute: 0,
    });
  });

  it("moves to BST at 01:00 UTC on 29 March 2026", () => {
    expect(localParts(new Date("2026-03-29T00:59:00Z"), LONDON).hour).toBe(0);
    expect(localParts(new Date("2026-03-29T01:00:00Z"), LONDON).hour).toBe(2);
  });

  it("rolls the local date over at local midnight in summer", () => {
    // 23:30 UTC on Saturday 4 July 2026 is 00:30 BST on Sunday 5 July.
    const p = localParts(new Date("2026-07-04T23:30:00Z"), LONDON);
    expect([p.day, p.weekday, p.hour]).toEqual([5, 7, 0]);
  });

  it("shows midnight as hour 0, never 24", () => {
    expect(localParts(new Date("2026-01-01T00:00:00Z"), "UTC").hour).toBe(0);
  });
});

describe("weekHourSlot", () => {
  it("numbers Monday 00 as 0 and Sunday 23 as 167", () => {
    expect(weekHourSlot(new Date("2026-01-05T00:00:00Z"), "UTC")).toBe(0);
    expect(weekHourSlot(new Date("2026-01-11T23:00:00Z"), "UTC")).toBe(167);
  });
});
