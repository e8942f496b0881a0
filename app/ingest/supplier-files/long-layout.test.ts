import { describe, expect, it } from "vitest";
import { parseLongLayout, type LongLayoutMapping } from "./long-layout";
import { readCsv } from "./read-csv";
import { toTable } from "./table";
import type { Table } from "./types";

// Check values: UK civil time is GMT in winter and BST (UTC+1) from 01:00 UTC
// on the last Sunday of March to 01:00 UTC on the last Sunday of October (the
// Summer Time Order 2002; common practice). In 2026: 29 March (01:00 GMT →
// 02:00 BST, a 23-hour day of 46 half-hours) and 25 October (02:00 BST →
// 01:00 GMT, a 25-hour day of 50 half-hours). Instants below are worked out
// by hand from those rules.

const LONDON = { timeZone: "Europe/London" };

function table(lines: string[]): Table {
  const t = toTable(readCsv(["meter,time,kWh", ...lines].join("\n")));
  if (t === null) throw new Error("no table");
  return t;
}

const byColumns = (marks: "start" | "end"): LongLayoutMapping => ({
  layout: "long",
  meter: { column: 0 },
  time: { column: 1, marks },
  energy: { column: 2 },
  intervalMinutes: 30,
});

const spans = (r: ReturnType<typeof parseLongLayout>) =>
  r.readings.map((x) => `${x.start} ${x.end}`);

describe("parseLongLayout: times and zones", () => {
  it("reads start-stamped rows in the site's zone: GMT in January, BST in July", () => {
    const r = parseLongLayout(
      table([
        "CH-EL1,15/01/2026 00:00,12.5",
        'CH-EL1,01/07/2026 00:00,"1,234.5"',
      ]),
      byColumns("start"),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings).toEqual([
      {
        meter: "CH-EL1",
        quantity: "interval_energy",
        start: "2026-01-15T00:00:00.000Z",
        end: "2026-01-15T00:30:00.000Z",
        energy_kwh: 12.5,
      },
      {
        meter: "CH-EL1",
        quantity: "interval_energy",
        start: "2026-06-30T23:00:00.000Z",
        end: "2026-06-30T23:30:00.000Z",
        energy_kwh: 1234.5,
      },
    ]);
    expect(r.readingRows).toEqual([2, 3]);
  });

  it("reads end-stamped rows (supplier files often stamp the end of the half-hour), 24:00 included", () => {
    const r = parseLongLayout(
      table(["CH-EL1,15/01/2026 00:30,1", "CH-EL1,15/01/2026 24:00,2"]),
      byColumns("end"),
      LONDON,
    );
    expect(spans(r)).toEqual([
      "2026-01-15T00:00:00.000Z 2026-01-15T00:30:00.000Z",
      "2026-01-15T23:30:00.000Z 2026-01-16T00:00:00.000Z",
    ]);
  });

  it("refuses 01:00 and 01:30 on 29 March 2026, which do not exist in London, and reads 02:00 as 01:00 UTC", () => {
    const r = parseLongLayout(
      table([
        "CH-EL1,29/03/2026 00:30,1",
        "CH-EL1,29/03/2026 01:00,1",
        "CH-EL1,29/03/2026 01:30,1",
        "CH-EL1,29/03/2026 02:00,1",
      ]),
      byColumns("start"),
      LONDON,
    );
    expect(r.errors).toEqual([
      {
        row: 3,
        column: "time",
        message:
          "29/03/2026 01:00 does not exist in Europe/London: the clocks go forward an hour that night",
      },
      {
        row: 4,
        column: "time",
        message:
          "29/03/2026 01:30 does not exist in Europe/London: the clocks go forward an hour that night",
      },
    ]);
    expect(spans(r)).toEqual([
      "2026-03-29T00:30:00.000Z 2026-03-29T01:00:00.000Z",
      "2026-03-29T01:00:00.000Z 2026-03-29T01:30:00.000Z",
    ]);
  });

  const autumnTimes = ["00:30", "01:00", "01:30", "01:00", "01:30", "02:00"];

  it("reads 25 October 2026's repeated 01:00 and 01:30 in file order: first BST, then GMT (start-stamped)", () => {
    const r = parseLongLayout(
      table(autumnTimes.map((t) => `CH-EL1,25/10/2026 ${t},1`)),
      byColumns("start"),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings.map((x) => x.start)).toEqual([
      "2026-10-24T23:30:00.000Z",
      "2026-10-25T00:00:00.000Z",
      "2026-10-25T00:30:00.000Z",
      "2026-10-25T01:00:00.000Z",
      "2026-10-25T01:30:00.000Z",
      "2026-10-25T02:00:00.000Z",
    ]);
    expect(r.notes.join(" ")).toContain(
      "25/10/2026: the clocks go back in Europe/London",
    );
  });

  it("reads the same repeated stamps as interval ends when the file stamps ends", () => {
    const r = parseLongLayout(
      table(autumnTimes.map((t) => `CH-EL1,25/10/2026 ${t},1`)),
      byColumns("end"),
      LONDON,
    );
    expect(r.readings.map((x) => x.end)).toEqual([
      "2026-10-24T23:30:00.000Z",
      "2026-10-25T00:00:00.000Z",
      "2026-10-25T00:30:00.000Z",
      "2026-10-25T01:00:00.000Z",
      "2026-10-25T01:30:00.000Z",
      "2026-10-25T02:00:00.000Z",
    ]);
  });

  it("counts the repeat per meter, and refuses a third row at a repeated time", () => {
    const r = parseLongLayout(
      table([
        "A,25/10/2026 01:00,1",
        "B,25/10/2026 01:00,1",
        "A,25/10/2026 01:00,1",
        "A,25/10/2026 01:00,1",
      ]),
      byColumns("start"),
      LONDON,
    );
    expect(r.readings.map((x) => `${x.meter} ${x.start}`)).toEqual([
      "A 2026-10-25T00:00:00.000Z",
      "B 2026-10-25T00:00:00.000Z",
      "A 2026-10-25T01:00:00.000Z",
    ]);
    expect(r.errors).toEqual([
      {
        row: 5,
        column: "time",
        message:
          "25/10/2026 01:00 happens twice in Europe/London, and this is its third row for meter A",
      },
    ]);
  });

  it("takes an ISO 8601 offset as given, whatever the site's zone", () => {
    const r = parseLongLayout(
      table(["A,2026-03-29T01:30:00+01:00,1", "A,2026-03-29T01:30:00Z,1"]),
      byColumns("start"),
      LONDON,
    );
    expect(r.errors).toEqual([]);
    expect(r.readings.map((x) => x.start)).toEqual([
      "2026-03-29T00:30:00.000Z",
      "2026-03-29T01:30:00.000Z",
    ]);
  });

  it("reads a file kept in GMT all year when the zone is UTC", () => {
    const r = parseLongLayout(
      table(["A,29/03/2026 01:00,1"]),
      byColumns("start"),
      { timeZone: "UTC" },
    );
    expect(r.readings.map((x) => x.start)).toEqual([
      "2026-03-29T01:00:00.000Z",
    ]);
  });

  it("makes quarter-hour and hourly intervals from the mapping's resolution", () => {
    const t = table(["A,15/01/2026 10:00,1"]);
    expect(
      spans(
        parseLongLayout(
          t,
          { ...byColumns("start"), intervalMinutes: 15 },
          LONDON,
        ),
      ),
    ).toEqual(["2026-01-15T10:00:00.000Z 2026-01-15T10:15:00.000Z"]);
    expect(
      spans(
        parseLongLayout(
          t,
          { ...byColumns("end"), intervalMinutes: 60 },
          LONDON,
        ),
      ),
    ).toEqual(["2026-01-15T09:00:00.000Z 2026-01-15T10:00:00.000Z"]);
  });
});

describe("parseLongLayout: values, meters and refusals", () => {
  it("skips blank values (no reading, not zero), refuses negative and non-numeric ones with row and column", () => {
    const r = parseLongLayout(
      table([
        "A,15/01/2026 00:00,",
        "A,15/01/2026 00:30,0",
        "A,15/01/2026 01:00,-2",
        "A,15/01/2026 01:30,lots",
      ]),
      byColumns("start"),
      LONDON,
    );
    expect(r.readings.map((x) => x.energy_kwh)).toEqual([0]);
    expect(r.readingRows).toEqual([3]);
    expect(r.errors.map((e) => [e.row, e.column])).toEqual([
      [4, "kWh"],
      [5, "kWh"],
    ]);
    expect(r.errors[0].message).toContain("negative");
    expect(r.errors[1].message).toBe('"lots" is not a number of kWh');
  });

  it("names every problem of a row, and refuses a date without a time", () => {
    const r = parseLongLayout(
      table([",not a date,-1", "A,15/01/2026,1"]),
      byColumns("start"),
      LONDON,
    );
    expect(r.errors).toEqual([
      { row: 2, column: "meter", message: "no meter code" },
      { row: 2, column: "kWh", message: expect.stringContaining("negative") },
      {
        row: 2,
        column: "time",
        message: expect.stringContaining('"not a date" is not a date and time'),
      },
      { row: 3, column: "time", message: "15/01/2026 has no time of day" },
    ]);
    expect(r.readings).toEqual([]);
  });

  it("uses one meter chosen for the whole file", () => {
    const t = toTable(readCsv("Date,Consumption\n15/01/2026 00:00,4\n"))!;
    const r = parseLongLayout(
      t,
      {
        layout: "long",
        meter: { code: " NP-EL1 " },
        time: { column: 0, marks: "start" },
        energy: { column: 1 },
        intervalMinutes: 30,
      },
      LONDON,
    );
    expect(r.readings.map((x) => [x.meter, x.energy_kwh])).toEqual([
      ["NP-EL1", 4],
    ]);
  });

  it("refuses a second row for the same interval and meter, naming the first", () => {
    const r = parseLongLayout(
      table([
        "A,15/01/2026 00:00,1",
        "A,15/01/2026 00:00,2",
        "B,15/01/2026 00:00,2",
      ]),
      byColumns("start"),
      LONDON,
    );
    expect(r.readings).toHaveLength(2);
    expect(r.errors).toEqual([
      {
        row: 3,
        column: "time",
        message: "row 2 already gives this interval of meter A",
      },
    ]);
  });

  it("states the date order it chose, and follows the person's choice instead", () => {
    const t = table(["A,01/02/2026 00:00,1"]);
    const guessed = parseLongLayout(t, byColumns("start"), LONDON);
    expect(guessed.readings[0].start).toBe("2026-02-01T00:00:00.000Z");
    expect(guessed.notes[0]).toContain("the UK convention");
    const chosen = parseLongLayout(t, byColumns("start"), {
      ...LONDON,
      dateOrder: "mdy",
    });
    expect(chosen.readings[0].start).toBe("2026-01-02T00:00:00.000Z");
    expect(chosen.notes).toEqual([]);
  });

  it("answers mapping mistakes against the header row instead of throwing", () => {
    const t = table(["A,15/01/2026 00:00,1"]);
    const r = parseLongLayout(
      t,
      {
        ...byColumns("start"),
        energy: { column: 7 },
        intervalMinutes: 20 as 30,
      },
      { timeZone: "Nowhere/Town" },
    );
    expect(r.readings).toEqual([]);
    expect(r.errors.map((e) => [e.row, e.message])).toEqual([
      [1, "The energy column is not one of the file's 3 columns (A to C)."],
      [1, '"Nowhere/Town" is not a time zone.'],
      [1, "The interval length must be 15, 30 or 60 minutes."],
    ]);
    expect(
      parseLongLayout(t, { ...byColumns("start"), meter: { code: "" } }, LONDON)
        .errors[0].message,
    ).toContain("Choose the meter");
  });

  it("lists the first maxErrors refusals and counts them all", () => {
    const lines = Array.from(
      { length: 30 },
      (_, i) => `A,15/01/2026 00:00,bad${i}`,
    );
    const r = parseLongLayout(table(lines), byColumns("start"), {
      ...LONDON,
      maxErrors: 5,
    });
    expect(r.errors).toHaveLength(5);
    expect(r.errorCount).toBe(30);
    expect(r.errors[4].row).toBe(6);
  });
});
