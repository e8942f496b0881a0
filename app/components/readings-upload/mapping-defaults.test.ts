import { describe, expect, it } from "vitest";
import { intervalHeadings } from "~/ingest/supplier-files/templates";
import { initialMapping, mappingFor } from "./mapping-defaults";

describe("initialMapping", () => {
  it("takes the suggested one-row-per-day mapping of a template's header", () => {
    const header = ["meter", "date", ...intervalHeadings(60)];
    expect(initialMapping(header, "X", 60)).toEqual({
      layout: "wide",
      meter: { column: 0 },
      date: { column: 1 },
      intervals: { firstColumn: 2, count: 24 },
    });
  });

  it("chooses the fallback meter for the whole file when no column holds meter codes", () => {
    const mapping = initialMapping(
      ["Reading end", "Consumption (kWh)"],
      "CH-EL1",
      30,
    );
    expect(mapping).toEqual({
      layout: "long",
      meter: { code: "CH-EL1" },
      time: { column: 0, marks: "end" },
      energy: { column: 1 },
      intervalMinutes: 30,
    });
  });

  it("falls back to plain columns for a header it does not recognise", () => {
    const mapping = initialMapping(["a", "b", "c"], "M", 60);
    expect(mapping).toMatchObject({
      layout: "long",
      meter: { code: "M" },
      time: { column: 0 },
      energy: { column: 1 },
    });
  });
});

describe("mappingFor", () => {
  it("switches to one row per day keeping the meter, with the date and its following columns", () => {
    const header = [
      "Site",
      "Day",
      ...Array.from({ length: 48 }, (_, i) => `HH${i + 1}`),
    ];
    expect(mappingFor("wide", header, { column: 0 }, 60)).toEqual({
      layout: "wide",
      meter: { column: 0 },
      date: { column: 1 },
      intervals: { firstColumn: 2, count: 48 },
    });
  });

  it("never gives the time and the kWh the same column", () => {
    const mapping = mappingFor("long", ["x", "y"], { code: "M" }, 60);
    expect(
      mapping.layout === "long" &&
        mapping.time.column !== mapping.energy.column,
    ).toBe(true);
  });
});
