import { describe, expect, it } from "vitest";
import {
  detectDateOrder,
  parseDateText,
  readDateCell,
  serialToWall,
} from "./date-text";

const wall = (text: string) => Date.parse(`${text}Z`);

describe("parseDateText", () => {
  it("reads dd/mm/yyyy hh:mm day first: 22/11/2026 02:00 (the value issue #14 says was refused)", () => {
    expect(parseDateText("22/11/2026 02:00", "dmy")).toEqual({
      wall: wall("2026-11-22T02:00:00"),
      hasTime: true,
    });
  });

  it("reads single-digit fields, seconds, and dots or dashes between the date's parts", () => {
    expect(parseDateText("1/4/2026 7:30", "dmy")).toEqual({
      wall: wall("2026-04-01T07:30:00"),
      hasTime: true,
    });
    expect(parseDateText("01.04.2026 07:30:15", "dmy")).toEqual({
      wall: wall("2026-04-01T07:30:15"),
      hasTime: true,
    });
    expect(parseDateText("01-04-2026", "dmy")).toEqual({
      wall: wall("2026-04-01T00:00:00"),
      hasTime: false,
    });
  });

  it("reads month first when told: 04/01/2026 is 1 April", () => {
    expect(parseDateText("04/01/2026 00:30", "mdy")).toEqual({
      wall: wall("2026-04-01T00:30:00"),
      hasTime: true,
    });
  });

  it("reads yyyy-mm-dd hh:mm and ISO 8601 without offset as wall-clock time", () => {
    expect(parseDateText("2026-03-29 00:30", "dmy")).toEqual({
      wall: wall("2026-03-29T00:30:00"),
      hasTime: true,
    });
    expect(parseDateText("2026-03-29T00:30:00.000", "dmy")).toEqual({
      wall: wall("2026-03-29T00:30:00"),
      hasTime: true,
    });
  });

  it("keeps an ISO 8601 offset: Z, +01:00, +0100, -05", () => {
    expect(parseDateText("2026-07-01T12:00:00Z", "dmy")).toMatchObject({
      offsetMinutes: 0,
    });
    expect(parseDateText("2026-07-01T12:00+01:00", "dmy")).toMatchObject({
      offsetMinutes: 60,
    });
    expect(parseDateText("2026-07-01T12:00+0100", "dmy")).toMatchObject({
      offsetMinutes: 60,
    });
    expect(parseDateText("2026-07-01T12:00-05", "dmy")).toMatchObject({
      offsetMinutes: -300,
    });
  });

  it("reads 24:00 as midnight ending the day, as end-stamped files write it", () => {
    expect(parseDateText("31/12/2026 24:00", "dmy")).toEqual({
      wall: wall("2027-01-01T00:00:00"),
      hasTime: true,
    });
  });

  it("refuses dates that do not exist, times past 23:59 and unknown formats, with the reason", () => {
    expect(parseDateText("31/02/2026", "dmy")).toEqual({
      error: '"31/02/2026" is not a date: that month has 28 days',
    });
    expect(parseDateText("29/03/2026 25:00", "dmy")).toEqual({
      error: '"29/03/2026 25:00" is not a time of day',
    });
    expect(parseDateText("24:30", "dmy")).toMatchObject({
      error: expect.stringContaining("not a date and time"),
    });
    expect(parseDateText("03/29/2026", "dmy")).toEqual({
      error:
        '"03/29/2026" is not a date read as day/month/year (dd/mm/yyyy): 29 is not a month',
    });
    expect(parseDateText("March 29, 2026", "dmy")).toMatchObject({
      error: expect.stringContaining("dd/mm/yyyy hh:mm"),
    });
  });
});

describe("serialToWall and readDateCell", () => {
  // Spreadsheet serial dates count days from 1899-12-30 (1900 system), so
  // 46110 is 29 March 2026 and 0.5 is noon; the 1904 system starts 1462 days
  // later (Office file format documentation; common knowledge).
  it("turns serial 46110.020833… into 29/03/2026 00:30, rounding the binary fraction", () => {
    expect(serialToWall(46110 + 1 / 48, false)).toBe(
      wall("2026-03-29T00:30:00"),
    );
    expect(serialToWall(46110 - 1462, true)).toBe(wall("2026-03-29T00:00:00"));
  });

  it("reads a Date cell's UTC fields as the wall-clock time written in the cell", () => {
    expect(
      readDateCell(new Date("2026-10-25T01:30:00Z"), "dmy", false),
    ).toEqual({
      wall: wall("2026-10-25T01:30:00"),
      hasTime: true,
    });
  });

  it("reads numbers as serials, blanks as nothing, and refuses the rest", () => {
    expect(readDateCell(46110.5, "dmy", false)).toEqual({
      wall: wall("2026-03-29T12:00:00"),
      hasTime: true,
    });
    expect(readDateCell("  ", "dmy", false)).toBeNull();
    expect(readDateCell(null, "dmy", false)).toBeNull();
    expect(readDateCell(-3, "dmy", false)).toEqual({
      error: "-3 is not a date",
    });
    expect(readDateCell(true, "dmy", false)).toEqual({
      error: "true is not a date",
    });
  });
});

describe("detectDateOrder", () => {
  it("settles day first from a day over 12 and says so", () => {
    const guess = detectDateOrder(
      ["01/03/2026 00:00", "13/03/2026 00:00"],
      "Date",
    );
    expect(guess.order).toBe("dmy");
    expect(guess.note).toBe(
      'Dates in column "Date" read as day/month/year (dd/mm/yyyy): "13/03/2026 00:00" can only be day first.',
    );
  });

  it("settles month first from a second number over 12", () => {
    const guess = detectDateOrder(["03/01/2026", "03/29/2026"], "Date");
    expect(guess.order).toBe("mdy");
    expect(guess.note).toContain('"03/29/2026" can only be month first');
  });

  it("reads an undecidable column (01/02 could be 1 Feb or 2 Jan) day first, the UK convention, and states it", () => {
    const guess = detectDateOrder(
      ["01/02/2026", "02/02/2026", "12/02/2026"],
      "Day",
    );
    expect(guess.order).toBe("dmy");
    expect(guess.note).toContain("the UK convention");
    expect(guess.note).toContain('"01/02/2026" could be read either way');
  });

  it("says nothing for ISO dates and spreadsheet date cells", () => {
    expect(
      detectDateOrder(["2026-03-29 00:00", new Date(0), 46110, null], "Time"),
    ).toEqual({
      order: "ymd",
      note: null,
    });
  });

  it("reads a mixed column day first and names both examples", () => {
    const guess = detectDateOrder(["13/01/2026", "01/13/2026"], "Date");
    expect(guess.order).toBe("dmy");
    expect(guess.note).toContain('"13/01/2026"');
    expect(guess.note).toContain('"01/13/2026"');
  });
});
