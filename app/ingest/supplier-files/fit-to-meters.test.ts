import { describe, expect, it } from "vitest";
import { fitToMeters, goodRowsOnly, type UploadMeter } from "./fit-to-meters";
import type { IntervalEnergyReading, ParseResult } from "./types";

const COLUMNS = { meterColumn: "meter", valueColumn: "kWh" };
const HOURLY: UploadMeter = {
  code: "H1",
  quantity: "water_heat",
  intervalMinutes: 60,
};
const HALF_HOURLY: UploadMeter = {
  code: "HH1",
  quantity: "electric_work",
  intervalMinutes: 30,
};
const REGISTER: UploadMeter = {
  code: "R1",
  quantity: "electric_register",
  intervalMinutes: 60,
};

const T0 = Date.parse("2026-11-02T00:00:00Z");

function reading(
  meter: string,
  startMinute: number,
  minutes: number,
  kwh: number,
): IntervalEnergyReading {
  return {
    meter,
    quantity: "interval_energy",
    start: new Date(T0 + startMinute * 60_000).toISOString(),
    end: new Date(T0 + (startMinute + minutes) * 60_000).toISOString(),
    energy_kwh: kwh,
  };
}

function parsed(
  readings: IntervalEnergyReading[],
  rows: number[],
): ParseResult {
  return { readings, readingRows: rows, errors: [], errorCount: 0, notes: [] };
}

describe("fitToMeters", () => {
  it("passes readings at the meter's own resolution through unchanged", () => {
    const input = [reading("H1", 0, 60, 1.5), reading("HH1", 30, 30, 0.25)];
    const fit = fitToMeters(
      parsed(input, [2, 3]),
      [HOURLY, HALF_HOURLY],
      COLUMNS,
    );
    expect(fit.readings).toEqual(input);
    expect(fit.readingRows).toEqual([2, 3]);
    expect(fit.errorCount).toBe(0);
  });

  it("refuses an unknown meter code and a register meter once per row, at the meter column", () => {
    const input = [
      reading("NOPE", 0, 60, 1),
      reading("NOPE", 60, 60, 1),
      reading("R1", 0, 60, 1),
    ];
    const fit = fitToMeters(
      parsed(input, [2, 2, 3]),
      [HOURLY, REGISTER],
      COLUMNS,
    );
    expect(fit.readings).toEqual([]);
    expect(fit.errors).toEqual([
      {
        row: 2,
        column: "meter",
        message: 'no meter with the code "NOPE" in this organisation',
      },
      {
        row: 3,
        column: "meter",
        message:
          "meter R1 is a register (cumulative kWh): upload its register reads, not kWh per interval",
      },
    ]);
    expect(fit.errorCount).toBe(2);
  });

  it("sums half-hours into an hourly meter's hours, rounded to the stored six decimals", () => {
    const input = [
      reading("H1", 0, 30, 0.1),
      reading("H1", 30, 30, 0.2),
      reading("H1", 60, 30, 1.25),
      reading("H1", 90, 30, 2.5),
    ];
    const fit = fitToMeters(parsed(input, [2, 2, 3, 3]), [HOURLY], COLUMNS);
    expect(fit.readings).toEqual([
      reading("H1", 0, 60, 0.3),
      reading("H1", 60, 60, 3.75),
    ]);
    expect(fit.readingRows).toEqual([2, 3]);
    expect(fit.errorCount).toBe(0);
    expect(fit.notes).toEqual([
      "Meter H1 records 60-minute intervals: the file's 30-minute values are added up into them, 2 to each.",
    ]);
  });

  it("sums quarter-hours into half-hours for a half-hourly meter", () => {
    const input = [0, 15, 30, 45].map((m, i) => reading("HH1", m, 15, i + 1));
    const fit = fitToMeters(
      parsed(input, [2, 2, 2, 2]),
      [HALF_HOURLY],
      COLUMNS,
    );
    expect(fit.readings).toEqual([
      reading("HH1", 0, 30, 3),
      reading("HH1", 30, 30, 7),
    ]);
  });

  it("refuses an hour with a half-hour missing, and one given twice does not complete it", () => {
    const input = [
      reading("H1", 0, 30, 1),
      reading("H1", 0, 30, 1),
      reading("H1", 60, 30, 1),
      reading("H1", 90, 30, 1),
    ];
    const fit = fitToMeters(parsed(input, [2, 3, 4, 5]), [HOURLY], COLUMNS);
    expect(fit.readings).toEqual([reading("H1", 60, 60, 2)]);
    expect(fit.errors).toEqual([
      {
        row: 2,
        column: "kWh",
        message:
          "meter H1 records 60-minute intervals; the one starting 2026-11-02 00:00 UTC is not complete in the file, so it is not stored",
      },
    ]);
  });

  it("refuses intervals longer than the meter's, which cannot be split", () => {
    const fit = fitToMeters(
      parsed([reading("HH1", 0, 60, 4)], [7]),
      [HALF_HOURLY],
      COLUMNS,
    );
    expect(fit.readings).toEqual([]);
    expect(fit.errors[0]).toMatchObject({ row: 7, column: "kWh" });
    expect(fit.errors[0].message).toMatch(
      /60-minute intervals and meter HH1 records 30-minute/,
    );
  });

  it("keeps the parser's refusals and counts, in row order", () => {
    const input = parsed([reading("NOPE", 0, 60, 1)], [5]);
    input.errors = [{ row: 3, column: "date", message: "no date" }];
    input.errorCount = 1;
    const fit = fitToMeters(input, [HOURLY], COLUMNS);
    expect(fit.errors.map((e) => e.row)).toEqual([3, 5]);
    expect(fit.errorCount).toBe(2);
  });
});

describe("goodRowsOnly", () => {
  it("leaves out every reading of a row with any refusal", () => {
    const input = parsed(
      [
        reading("H1", 0, 60, 1),
        reading("H1", 60, 60, 2),
        reading("H1", 120, 60, 3),
      ],
      [2, 3, 3],
    );
    input.errors = [{ row: 3, column: "02:00", message: "bad" }];
    input.errorCount = 1;
    const good = goodRowsOnly(fitToMeters(input, [HOURLY], COLUMNS));
    expect(good).toEqual({
      readings: [reading("H1", 0, 60, 1)],
      readingRows: [2],
    });
  });
});
