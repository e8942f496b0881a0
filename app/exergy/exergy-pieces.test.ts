import { describe, expect, it } from "vitest";
import type { PreparedReading } from "~/ingest/prepare-readings.server";
import { exergyPieces } from "./exergy-pieces";

const HOUR = 3_600_000;

function reading(start: string, hours: number): PreparedReading {
  const from = new Date(start);
  return {
    meter: { id: "m1", intervalMinutes: 60 },
    readingTime: from,
    endTime: new Date(from.getTime() + hours * HOUR),
    exergyBasis: {
      heatKwh: 10,
      entropyKwhPerK: 0.03,
      flowLimitC: 70,
      heating: true,
    },
  } as unknown as PreparedReading;
}

describe("exergyPieces", () => {
  it("says pieces are not shared when each interval has one reading", () => {
    const p = exergyPieces([
      reading("2025-01-15T22:00:00Z", 1),
      reading("2025-01-15T23:00:00Z", 2),
    ]);
    expect(p.starts).toHaveLength(3);
    expect(p.shared).toBe(false);
  });

  it("says they may be shared when two readings fall in one interval", () => {
    const p = exergyPieces([
      reading("2025-01-15T22:00:00Z", 0.5),
      reading("2025-01-15T22:30:00Z", 0.5),
    ]);
    expect(p.starts).toEqual([
      "2025-01-15T22:00:00.000Z",
      "2025-01-15T22:00:00.000Z",
    ]);
    expect(p.shared).toBe(true);
  });
});
