import { describe, expect, it } from "vitest";
import { rowToReading } from "./csv";
import { meterKindError, resolutionError } from "./interval-energy";
import {
  parseReading,
  parseWithSchemas,
  wellFormedReadingSchema,
} from "./reading-schema";

const NOW = new Date("2026-06-01T12:00:00Z");

const energy = (fields: Record<string, unknown> = {}) => ({
  meter: "S-1",
  quantity: "interval_energy",
  start: "2026-05-01T10:00:00Z",
  end: "2026-05-01T11:00:00Z",
  energy_kwh: 12.5,
  ...fields,
});

describe("interval_energy readings: the envelope", () => {
  it("parses the kWh of an interval, keeping it as sent", () => {
    const parsed = parseReading(energy(), NOW);
    expect(parsed).toEqual({
      ok: true,
      reading: {
        kind: "interval_energy",
        meter: "S-1",
        quantity: "interval_energy",
        start: new Date("2026-05-01T10:00:00Z"),
        end: new Date("2026-05-01T11:00:00Z"),
        energyKwh: 12.5,
      },
    });
    expect(parseReading(energy({ energy_kwh: 0 }), NOW).ok).toBe(true);
  });

  it.each([
    [
      { energy_kwh: -0.5 },
      "energy_kwh: must not be negative; the sign comes from the meter's orientation (import or export)",
    ],
    [{ energy_kwh: "12.5" }, "energy_kwh: expected a finite number of kWh"],
    [{ energy_kwh: Number.NaN }, "energy_kwh: expected a finite number of kWh"],
    [{ energy_kwh: undefined }, "energy_kwh: expected a finite number of kWh"],
    [
      { start: "2026-05-01 10:00" },
      "start: expected an ISO 8601 date-time with offset",
    ],
    [{ end: "2026-05-01T10:00:00Z" }, "end: must be after start"],
    [{ start: "2099-01-01T00:00:00Z" }, "start: is in the future"],
    [{ volume_m3: 2 }, 'Unrecognized key: "volume_m3"'],
  ])("refuses %j: %s", (fields, reason) => {
    const parsed = parseReading(energy(fields), NOW);
    expect(parsed).toEqual({ ok: false, error: reason });
    expect(parseWithSchemas(energy(fields), NOW)).toEqual(parsed);
  });

  it("is one of the readings the API document describes", () => {
    expect(wellFormedReadingSchema.safeParse(energy()).success).toBe(true);
    expect(
      wellFormedReadingSchema.safeParse(energy({ energy_kwh: -1 })).success,
    ).toBe(false);
  });
});

describe("interval_energy readings: the meter's intervals", () => {
  const at = (iso: string) => new Date(iso);

  it("takes exactly one interval of the meter's resolution, aligned in UTC", () => {
    expect(
      resolutionError(
        60,
        at("2026-05-01T10:00:00Z"),
        at("2026-05-01T11:00:00Z"),
      ),
    ).toBeNull();
    // 10:00 in a +05:30 zone is 04:30 UTC: not on a UTC hour.
    expect(
      resolutionError(
        60,
        at("2026-05-01T10:00:00+05:30"),
        at("2026-05-01T11:00:00+05:30"),
      ),
    ).toBe(
      "start: this meter records 60-minute intervals, which start on a multiple of 60 minutes in UTC; the reading starts at 04:30 UTC",
    );
    expect(
      resolutionError(
        60,
        at("2026-05-01T10:00:00Z"),
        at("2026-05-01T10:30:00Z"),
      ),
    ).toBe(
      "end: this meter records 60-minute intervals; the reading covers 30 minutes",
    );
    expect(
      resolutionError(
        30,
        at("2026-05-01T10:30:00Z"),
        at("2026-05-01T11:00:00Z"),
      ),
    ).toBeNull();
  });

  it("is refused by register meters, whose hours come from their reads", () => {
    expect(meterKindError({ code: "E-1", quantity: "electric_register" })).toBe(
      "quantity: meter E-1 is a register (electric_register); send its register reads, not interval_energy",
    );
    expect(meterKindError({ code: "W-1", quantity: "water_heat" })).toBeNull();
  });
});

describe("interval_energy rows in a CSV upload", () => {
  it("a row with the API's field names becomes a reading the envelope takes", () => {
    const reading = rowToReading({
      meter: "S-1",
      quantity: "interval_energy",
      start: "2026-05-01T10:00:00Z",
      end: "2026-05-01T11:00:00Z",
      energy_kwh: "12.5",
      volume_m3: "",
    });
    expect(reading).toEqual(energy());
    expect(parseReading(reading, NOW).ok).toBe(true);
  });
});
