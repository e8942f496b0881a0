import { describe, expect, it } from "vitest";
import { parseSupplierFile } from "./parse-supplier-file";
import { readCsv } from "./read-csv";
import { suggestMapping } from "./suggest-mapping";
import { toTable } from "./table";
import { csvTemplate, intervalHeadings, templateFileName } from "./templates";

// Meter codes CH-EL1 and NP-EL1 are the demo estate's invented electricity
// meters of Civic Hall and Northgate Primary School (shared/design.md, "Demo
// scenario"; seeds/scenario/larchmere-estate.ts).

const LONDON = { timeZone: "Europe/London" };

function readTemplate(csv: string) {
  const table = toTable(readCsv(csv))!;
  const mapping = suggestMapping(table.header);
  if (mapping === null) throw new Error("template not recognised");
  return { table, mapping, result: parseSupplierFile(table, mapping, LONDON) };
}

describe("intervalHeadings", () => {
  it("heads a day's columns by interval start in clock order", () => {
    expect(intervalHeadings(30).slice(0, 3)).toEqual([
      "00:00",
      "00:30",
      "01:00",
    ]);
    expect(intervalHeadings(30)).toHaveLength(48);
    expect(intervalHeadings(60).at(-1)).toBe("23:00");
    expect(intervalHeadings(15)).toHaveLength(96);
  });
});

describe("csvTemplate", () => {
  it("gives the one-row-per-interval template a header and two rows that read back without error", () => {
    const csv = csvTemplate({ layout: "long" });
    const lines = csv.trim().split("\n");
    expect(lines[0]).toBe("meter,start,energy_kwh");
    expect(lines).toHaveLength(3);
    const { mapping, result } = readTemplate(csv);
    expect(mapping).toMatchObject({
      layout: "long",
      time: { column: 1, marks: "start" },
      energy: { column: 2 },
    });
    expect(result.errors).toEqual([]);
    expect(result.notes).toContain(
      'Dates in column "start" read as day/month/year (dd/mm/yyyy): "14/04/2026 00:00" can only be day first.',
    );
    expect(result.readings.map((r) => [r.meter, r.start, r.end])).toEqual([
      ["CH-EL1", "2026-04-13T23:00:00.000Z", "2026-04-13T23:30:00.000Z"],
      ["CH-EL1", "2026-04-13T23:30:00.000Z", "2026-04-14T00:00:00.000Z"],
    ]);
  });

  it("gives the one-row-per-day template 48 half-hour columns and two meters' rows that read back", () => {
    const csv = csvTemplate({ layout: "wide" });
    const lines = csv.trim().split("\n");
    expect(lines[0]).toBe(["meter", "date", ...intervalHeadings(30)].join(","));
    expect(lines).toHaveLength(3);
    const { mapping, result } = readTemplate(csv);
    expect(mapping).toEqual({
      layout: "wide",
      meter: { column: 0 },
      date: { column: 1 },
      intervals: { firstColumn: 2, count: 48 },
    });
    expect(result.errors).toEqual([]);
    expect(result.readings).toHaveLength(96);
    expect(new Set(result.readings.map((r) => r.meter))).toEqual(
      new Set(["CH-EL1", "NP-EL1"]),
    );
  });

  it("follows the resolution and the organisation's own meter codes", () => {
    const csv = csvTemplate({
      layout: "wide",
      intervalMinutes: 15,
      meterCodes: ["M-1", "M-2"],
    });
    const { result } = readTemplate(csv);
    expect(result.readings).toHaveLength(192);
    expect(result.readings[0]).toMatchObject({
      meter: "M-1",
      end: "2026-04-13T23:15:00.000Z",
    });
    expect(templateFileName({ layout: "wide", intervalMinutes: 15 })).toBe(
      "interval-energy-one-row-per-day-15min.csv",
    );
  });
});

describe("suggestMapping", () => {
  it("recognises an end-stamped supplier heading and a file without a meter column", () => {
    expect(suggestMapping(["Period end", "Consumption (kWh)"], 30)).toEqual({
      layout: "long",
      meter: { code: "" },
      time: { column: 0, marks: "end" },
      energy: { column: 1 },
      intervalMinutes: 30,
    });
  });

  it("finds 48 numbered interval columns after the meter and date, and 50 with the autumn extra", () => {
    const numbered = [
      "MPAN",
      "Reading date",
      ...Array.from({ length: 50 }, (_, i) => `HH${i + 1}`),
    ];
    expect(suggestMapping(numbered)).toMatchObject({
      layout: "wide",
      meter: { column: 0 },
      date: { column: 1 },
      intervals: { firstColumn: 2, count: 50 },
    });
    expect(suggestMapping(numbered.slice(0, 50))).toMatchObject({
      intervals: { firstColumn: 2, count: 48 },
    });
  });

  it("gives up on a header it cannot read", () => {
    expect(suggestMapping(["a", "b"])).toBeNull();
  });
});
