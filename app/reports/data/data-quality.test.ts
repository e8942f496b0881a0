import { describe, expect, it } from "vitest";
import {
  dataQuality,
  hoursBetween,
  meterQuality,
  type MeterHourCounts,
} from "./data-quality";

const at = (iso: string) => new Date(iso);

const meter = (over: Partial<MeterHourCounts>): MeterHourCounts => ({
  siteName: "Site",
  code: "M-1",
  name: "Meter",
  carrier: "heat",
  orientation: "import",
  subMeter: false,
  retired: false,
  from: at("2025-01-01T00:00:00Z"),
  to: at("2025-01-02T00:00:00Z"),
  measured: 24,
  estimated: 0,
  edited: 0,
  firstMeasured: at("2025-01-01T00:00:00Z"),
  lastMeasured: at("2025-01-01T23:00:00Z"),
  longestInnerGapHours: 0,
  conflicts: 0,
  openConflicts: 0,
  ...over,
});

describe("data quality", () => {
  it("counts whole hours only", () => {
    expect(
      hoursBetween(at("2025-01-01T00:00:00Z"), at("2025-01-02T00:00:00Z")),
    ).toBe(24);
    // Installed at 10:30, generated at 12:15: only the 11:00 hour is whole.
    expect(
      hoursBetween(at("2025-01-01T10:30:00Z"), at("2025-01-01T12:15:00Z")),
    ).toBe(1);
    expect(
      hoursBetween(at("2025-01-02T00:00:00Z"), at("2025-01-01T00:00:00Z")),
    ).toBe(0);
  });

  it("missing hours are those without any value; silence counts the edges of the window", () => {
    const q = meterQuality(
      meter({
        measured: 10,
        estimated: 4,
        edited: 1,
        firstMeasured: at("2025-01-01T05:00:00Z"),
        lastMeasured: at("2025-01-01T14:00:00Z"),
        longestInnerGapHours: 2,
      }),
    );
    expect(q.missingHours).toBe(24 - 15);
    // Nothing measured after 14:00: 15:00 to midnight is 9 hours.
    expect(q.longestSilentHours).toBe(9);
  });

  it("a meter with no measured hour was silent all along", () => {
    const q = meterQuality(
      meter({ measured: 0, firstMeasured: null, lastMeasured: null }),
    );
    expect(q.longestSilentHours).toBe(24);
    expect(q.missingHours).toBe(24);
  });

  it("sums over meters and counts silent ones", () => {
    const q = dataQuality([
      meter({}),
      meter({
        code: "M-2",
        measured: 0,
        firstMeasured: null,
        lastMeasured: null,
        conflicts: 2,
        openConflicts: 1,
      }),
    ]);
    expect(q).toMatchObject({
      expectedHours: 48,
      measuredHours: 24,
      missingHours: 24,
      silentMeters: 1,
      conflicts: 2,
      openConflicts: 1,
    });
  });
});
