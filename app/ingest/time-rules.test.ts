import { describe, expect, it } from "vitest";
import {
  correctionIntervalError,
  installedError,
  instantError,
} from "./time-rules";

const NOW = new Date("2026-06-01T12:00:00Z");
const meter = {
  code: "W-1",
  installedAt: new Date("2020-01-01T00:00:00Z"),
  removedAt: new Date("2026-03-13T00:00:00Z"),
  intervalMinutes: 60,
};
const hour = (iso: string) =>
  correctionIntervalError(meter, new Date(iso), NOW);

describe("correctionIntervalError: the ingest rules for one hour", () => {
  it("accepts a whole hour in the meter's life, its first and last included", () => {
    expect(hour("2026-03-11T08:00:00Z")).toBeNull();
    expect(hour("2020-01-01T00:00:00Z")).toBeNull();
    expect(hour("2026-03-13T00:00:00Z")).toBeNull();
  });

  it("refuses hours before installation or after removal, as ingest does", () => {
    for (const iso of ["2019-12-31T23:00:00Z", "2026-03-13T01:00:00Z"]) {
      expect(hour(iso)).toBe(
        `meter W-1 was not installed at ${iso.replace("Z", ".000Z")}`,
      );
      expect(hour(iso)).toBe(installedError(meter, new Date(iso)));
    }
  });

  it("refuses the future, 9999, year 0 and invalid dates with ingest's words", () => {
    const alive = { ...meter, removedAt: null };
    const at = (iso: string) =>
      correctionIntervalError(alive, new Date(iso), NOW);
    expect(at("2031-01-01T00:00:00Z")).toBe("interval: is in the future");
    expect(at("9999-12-31T23:00:00Z")).toBe("interval: is in the future");
    expect(at("0000-01-01T00:00:00Z")).toBe(
      "interval: before 1990-01-01 is not accepted",
    );
    expect(at("nonsense")).toBe("interval: is not a valid time");
    // Ten minutes of clock skew, as for a gateway's reading.
    expect(at("2026-06-01T12:00:00Z")).toBeNull();
    expect(instantError("start", new Date("2026-06-01T12:10:01Z"), NOW)).toBe(
      "start: is in the future",
    );
  });

  it("refuses a time that is not the start of an hour", () => {
    expect(hour("2026-03-11T08:30:00Z")).toBe(
      "interval: must start on the hour",
    );
  });

  it("takes a half-hourly meter's half-hours, and nothing in between", () => {
    const halfHourly = { ...meter, intervalMinutes: 30 };
    const at = (iso: string) =>
      correctionIntervalError(halfHourly, new Date(iso), NOW);
    expect(at("2026-03-11T08:30:00Z")).toBeNull();
    expect(at("2026-03-11T08:15:00Z")).toBe(
      "interval: must start on a multiple of 30 minutes",
    );
    const quarterly = { ...meter, intervalMinutes: 15 };
    expect(
      correctionIntervalError(quarterly, new Date("2026-03-11T08:45:00Z"), NOW),
    ).toBeNull();
  });
});
