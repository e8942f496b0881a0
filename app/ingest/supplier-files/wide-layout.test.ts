import { describe, expect, it } from "vitest";
import { readCsv } from "./read-csv";
import { toTable } from "./table";
import { intervalHeadings } from "./templates";
import type { Cell, ParseResult, Table } from "./types";
import { parseWideLayout, type WideLayoutMapping } from "./wide-layout";

// Check values: UK civil time is GMT in winter and BST (UTC+1) from 01:00 UTC
// on the last Sunday of March to 01:00 UTC on the last Sunday of October (the
// Summer Time Order 2002; common practice). In 2026: 29 March, when 01:00 GMT
// becomes 02:00 BST (23 hours, 46 half-hours, 01:00–02:00 local never
// happens), and 25 October, when 02:00 BST becomes 01:00 GMT (25 hours, 50
// half-hours, 01:00–02:00 local happens twice). Instants worked out by hand.

const LONDON = { timeZone: "Europe/London" };
const HALF_HOURS = intervalHeadings(30);

function wideTable(headings: string[], rows: Cell[][]): Table {
  const csv = [["meter", "date", ...headings], ...rows]
    .map((r) => r.map((c) => c ?? "").join(","))
    .join("\n");
  const t = toTable(readCsv(csv));
  if (t === null) throw new Error("no table");
  return t;
}

const mapping = (count: number): WideLayoutMapping => ({
  layout: "wide",
  meter: { column: 0 },
  date: { column: 1 },
  intervals: { firstColumn: 2, count },
});

/** n values 1, 2, 3 …: each distinct so a misplaced column shows. */
const values = (n: number): number[] =>
  Array.from({ length: n }, (_, i) => i + 1);
const startsOf = (r: ParseResult) => r.readings.map((x) => x.start);
const sum = (r: ParseResult) =>
  r.readings.reduce((s, x) => s + x.energy_kwh, 0);

describe("parseWideLayout: ordinary days", () => {
  it("reads 48 half-hour columns of a January day from local midnight (GMT = UTC)", () => {
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [["CH-EL1", "15/01/2026", ...values(48)]]),
      mapping(48),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings).toHaveLength(48);
    expect(r.readings[0]).toEqual({
      meter: "CH-EL1",
      quantity: "interval_energy",
      start: "2026-01-15T00:00:00.000Z",
      end: "2026-01-15T00:30:00.000Z",
      energy_kwh: 1,
    });
    expect(r.readings[47]).toMatchObject({
      start: "2026-01-15T23:30:00.000Z",
      end: "2026-01-16T00:00:00.000Z",
      energy_kwh: 48,
    });
    expect(r.readingRows.every((n) => n === 2)).toBe(true);
  });

  it("starts a July day at 23:00 UTC the day before (00:00 BST)", () => {
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [["CH-EL1", "01/07/2026", ...values(48)]]),
      mapping(48),
      LONDON,
    );
    expect(startsOf(r)[0]).toBe("2026-06-30T23:00:00.000Z");
    expect(startsOf(r)[47]).toBe("2026-07-01T22:30:00.000Z");
  });

  it("reads hourly (24) and quarter-hourly (96) columns at their resolution", () => {
    const hourly = parseWideLayout(
      wideTable(intervalHeadings(60), [["A", "15/01/2026", ...values(24)]]),
      mapping(24),
      LONDON,
    );
    expect(hourly.readings[1]).toMatchObject({
      start: "2026-01-15T01:00:00.000Z",
      end: "2026-01-15T02:00:00.000Z",
    });
    const quarters = parseWideLayout(
      wideTable(intervalHeadings(15), [["A", "15/01/2026", ...values(96)]]),
      mapping(96),
      LONDON,
    );
    expect(quarters.readings).toHaveLength(96);
    expect(quarters.readings[95]).toMatchObject({
      start: "2026-01-15T23:45:00.000Z",
      end: "2026-01-16T00:00:00.000Z",
    });
  });

  it("skips blank cells (not zero), refuses bad values by the column's heading, keeps the rest of the row", () => {
    const row: Cell[] = ["A", "15/01/2026", ...values(48)];
    row[2 + 1] = ""; // 00:30 blank
    row[2 + 15] = "-4"; // 07:30 negative
    row[2 + 16] = "n/a"; // 08:00 not a number
    row[2 + 17] = '"1,234.5"'; // 08:30 thousands separator
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [row]),
      mapping(48),
      LONDON,
    );
    expect(r.readings).toHaveLength(45);
    expect(
      r.readings.find((x) => x.start === "2026-01-15T08:30:00.000Z")
        ?.energy_kwh,
    ).toBe(1234.5);
    expect(r.errors.map((e) => [e.row, e.column])).toEqual([
      [2, "07:30"],
      [2, "08:00"],
    ]);
    expect(r.errors[0].message).toContain("negative");
  });

  it("reads one meter chosen for the file, a file without a meter column", () => {
    const t = toTable(
      readCsv(
        [
          ["date", ...HALF_HOURS].join(","),
          ["15/01/2026", ...values(48)].join(","),
        ].join("\n"),
      ),
    )!;
    const r = parseWideLayout(
      t,
      {
        layout: "wide",
        meter: { code: "NP-EL1" },
        date: { column: 0 },
        intervals: { firstColumn: 1, count: 48 },
      },
      LONDON,
    );
    expect(r.readings).toHaveLength(48);
    expect(r.readings.every((x) => x.meter === "NP-EL1")).toBe(true);
  });

  it("refuses a second row for the same meter and day, a date with a time, and values past the 48th column", () => {
    const r = parseWideLayout(
      wideTable(
        [...HALF_HOURS, "x1", "x2"],
        [
          ["A", "15/01/2026", ...values(48)],
          ["A", "15/01/2026", ...values(48)],
          ["A", "16/01/2026 10:00", ...values(48)],
          ["A", "17/01/2026", ...values(50)],
        ],
      ),
      mapping(50),
      LONDON,
    );
    expect(r.readings).toHaveLength(48);
    expect(r.errors).toEqual([
      {
        row: 3,
        column: "date",
        message: "row 2 already gives 15/01/2026 for meter A",
      },
      {
        row: 4,
        column: "date",
        message:
          "expected a date without a time of day: each row is one whole day",
      },
      {
        row: 5,
        column: "x2",
        message:
          "17/01/2026 has 48 half-hours in Europe/London, but the row has values past its 48th column",
      },
    ]);
  });
});

describe("parseWideLayout: the spring clock change, 29 March 2026 (46 half-hours)", () => {
  it("skips the two blank columns 01:00 and 01:30 of a 48-column row and reads 02:00 as 01:00 UTC", () => {
    const row: Cell[] = ["CH-EL1", "29/03/2026", ...values(48)];
    row[2 + 2] = "";
    row[2 + 3] = "";
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [row]),
      mapping(48),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings).toHaveLength(46);
    expect(r.readings.slice(0, 3).map((x) => [x.start, x.energy_kwh])).toEqual([
      ["2026-03-29T00:00:00.000Z", 1],
      ["2026-03-29T00:30:00.000Z", 2],
      ["2026-03-29T01:00:00.000Z", 5], // the "02:00" column
    ]);
    expect(r.readings[45]).toMatchObject({
      start: "2026-03-29T22:30:00.000Z",
      end: "2026-03-29T23:00:00.000Z",
      energy_kwh: 48,
    });
    expect(sum(r)).toBe((48 * 49) / 2 - 3 - 4);
  });

  it("refuses values at 01:00 and 01:30, explaining the day has 46 half-hours", () => {
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [["CH-EL1", "29/03/2026", ...values(48)]]),
      mapping(48),
      LONDON,
    );
    expect(r.readings).toEqual([]);
    expect(r.errors).toEqual([
      {
        row: 2,
        column: "01:00",
        message:
          "29/03/2026 has 46 half-hours in Europe/London (the clocks go forward an hour at 01:00), but the row has values in the columns for 01:00–02:00, times that do not exist that day: leave those 2 columns blank, or give the day's 46 values in order",
      },
    ]);
  });

  it("reads a row of the day's 46 values in order (the last two columns blank)", () => {
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [["CH-EL1", "29/03/2026", ...values(46)]]),
      mapping(48),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings).toHaveLength(46);
    expect(r.readings[2]).toMatchObject({
      start: "2026-03-29T01:00:00.000Z",
      energy_kwh: 3,
    });
    expect(r.readings[45]).toMatchObject({
      start: "2026-03-29T22:30:00.000Z",
      energy_kwh: 46,
    });
    expect(r.notes).toContain(
      "Row 2 (29/03/2026): the day's 46 values read in order, the clock-change hour left out.",
    );
  });

  it("skips the one blank 01:00 column of an hourly file (23 hours)", () => {
    const row: Cell[] = ["A", "29/03/2026", ...values(24)];
    row[2 + 1] = "";
    const r = parseWideLayout(
      wideTable(intervalHeadings(60), [row]),
      mapping(24),
      LONDON,
    );
    expect(r.readings).toHaveLength(23);
    expect(r.readings[1]).toMatchObject({
      start: "2026-03-29T01:00:00.000Z",
      end: "2026-03-29T02:00:00.000Z",
      energy_kwh: 3,
    });
  });
});

describe("parseWideLayout: the autumn clock change, 25 October 2026 (50 half-hours)", () => {
  const fiftyHeadings = values(50).map(String);

  it("maps 50 columns to the day's 50 half-hours, the repeated hour to both its UTC instants", () => {
    const r = parseWideLayout(
      wideTable(fiftyHeadings, [["CH-EL1", "25/10/2026", ...values(50)]]),
      mapping(50),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings).toHaveLength(50);
    expect(r.readings.slice(0, 7).map((x) => [x.start, x.energy_kwh])).toEqual([
      ["2026-10-24T23:00:00.000Z", 1], // 00:00 BST
      ["2026-10-24T23:30:00.000Z", 2],
      ["2026-10-25T00:00:00.000Z", 3], // 01:00 BST
      ["2026-10-25T00:30:00.000Z", 4], // 01:30 BST
      ["2026-10-25T01:00:00.000Z", 5], // 01:00 GMT
      ["2026-10-25T01:30:00.000Z", 6], // 01:30 GMT
      ["2026-10-25T02:00:00.000Z", 7], // 02:00 GMT
    ]);
    expect(r.readings[49]).toMatchObject({
      start: "2026-10-25T23:30:00.000Z",
      end: "2026-10-26T00:00:00.000Z",
    });
  });

  it("reads a 50-cell row in a 48-column file whose interval columns end the row", () => {
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [["CH-EL1", "25/10/2026", ...values(50)]]),
      mapping(48),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings).toHaveLength(50);
    expect(sum(r)).toBe((50 * 51) / 2);
  });

  it("refuses 48 values in a 48-column file, explaining the day has 50 half-hours", () => {
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [["CH-EL1", "25/10/2026", ...values(48)]]),
      mapping(48),
      LONDON,
    );
    expect(r.readings).toEqual([]);
    expect(r.errors).toEqual([
      {
        row: 2,
        column: "date",
        message:
          "25/10/2026 has 50 half-hours in Europe/London (the clocks go back an hour, so 01:00–02:00 happens twice), and the file gives 48 columns: give that day's 50 values in order, with the repeated hour twice",
      },
    ]);
  });

  it("refuses 48 values in a 50-column file: nothing says where the repeated hour is", () => {
    const r = parseWideLayout(
      wideTable(fiftyHeadings, [["CH-EL1", "25/10/2026", ...values(48)]]),
      mapping(50),
      LONDON,
    );
    expect(r.readings).toEqual([]);
    expect(r.errors[0].message).toContain("and the row gives 48 values");
  });

  it("reads ordinary days in a 50-column file (last two columns blank) beside the long day", () => {
    const r = parseWideLayout(
      wideTable(fiftyHeadings, [
        ["A", "24/10/2026", ...values(48)],
        ["A", "25/10/2026", ...values(50)],
        ["A", "26/10/2026", ...values(48)],
      ]),
      mapping(50),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings).toHaveLength(146);
    // Half-hours follow on without gap or overlap across the change.
    for (let i = 1; i < r.readings.length; i++)
      expect(r.readings[i].start).toBe(r.readings[i - 1].end);
  });
});

describe("parseWideLayout: dates and mapping", () => {
  it("reads spreadsheet date cells and serials in the date column", () => {
    const t: Table = {
      header: ["date", ...HALF_HOURS],
      headerRowNumber: 1,
      date1904: false,
      rows: [
        { number: 2, cells: [new Date("2026-07-01T00:00:00Z"), ...values(48)] },
        { number: 3, cells: [46110, ...values(48)] }, // serial 46110 = 29/03/2026
      ],
    };
    const r = parseWideLayout(
      t,
      {
        layout: "wide",
        meter: { code: "A" },
        date: { column: 0 },
        intervals: { firstColumn: 1, count: 48 },
      },
      LONDON,
    );
    expect(r.readings[0].start).toBe("2026-06-30T23:00:00.000Z");
    // 29/03/2026 with values in 01:00 and 01:30: refused by the day's rule.
    expect(r.errors.map((e) => e.row)).toEqual([3]);
  });

  it("refuses a column count that is no day's and answers without throwing", () => {
    const r = parseWideLayout(
      wideTable(HALF_HOURS.slice(0, 47), [["A", "15/01/2026", ...values(47)]]),
      mapping(47),
      LONDON,
    );
    expect(r.readings).toEqual([]);
    expect(r.errors).toEqual([
      {
        row: 1,
        column: "",
        message:
          "A day has 24 hourly, 48 half-hourly or 96 quarter-hourly intervals (25, 50 or 100 with room for the day the clocks go back); the mapping gives 47 interval columns.",
      },
    ]);
  });

  it("reads dd/mm dates day first when they could be either, and says so", () => {
    const r = parseWideLayout(
      wideTable(HALF_HOURS, [["A", "01/02/2026", ...values(48)]]),
      mapping(48),
      LONDON,
    );
    expect(r.readings[0].start).toBe("2026-02-01T00:00:00.000Z");
    expect(r.notes[0]).toContain("the UK convention");
  });
});
