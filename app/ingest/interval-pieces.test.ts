import { describe, expect, it } from "vitest";
import { HOUR_MS, splitAcrossIntervals } from "./hours";
import { intervalPieces, piecesOf } from "./interval-pieces";
import type { PreparedReading } from "./prepare-readings.server";

function random(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const T0 = Date.parse("2026-03-29T00:00:00Z");

function reading(
  next: () => number,
  meterId = "m1",
  intervalMinutes = 60,
): PreparedReading {
  const start = T0 + Math.floor(next() * 48 * 4) * 15 * 60_000;
  const minutes = [15, 30, 45, 60, 90, 120, 185, 300][Math.floor(next() * 8)];
  const energy = (next() - 0.2) * 10 ** Math.floor(next() * 6);
  return {
    index: 0,
    meter: { id: meterId, intervalMinutes } as PreparedReading["meter"],
    readingTime: new Date(start),
    endTime: new Date(start + minutes * 60_000),
    payload: {},
    payloadHash: "",
    energyKwh: energy.toFixed(6),
    registerKwh: null,
    uncertaintyKwh: next() < 0.3 ? null : (Math.abs(energy) / 50).toFixed(6),
  };
}

/** What every reading went through before: the split, always. */
function split(r: PreparedReading) {
  const energy = splitAcrossIntervals(
    r.readingTime,
    r.endTime!,
    Number(r.energyKwh),
  );
  const band = splitAcrossIntervals(
    r.readingTime,
    r.endTime!,
    Number(r.uncertaintyKwh ?? 0),
  );
  return energy.map((p, i) => ({
    hour: p.intervalStart.getTime(),
    energy: Number(p.energyKwh.toFixed(6)),
    band: Number(band[i].energyKwh.toFixed(6)),
  }));
}

describe("hour pieces", () => {
  it("give each reading's hours the same values as the full split", () => {
    const next = random(7);
    for (let i = 0; i < 20_000; i++) {
      const r = reading(next);
      const pieces = piecesOf(r).map((p) => ({
        hour: p.start,
        energy: Number(p.energy),
        band: Number(p.band),
      }));
      expect(pieces).toEqual(split(r));
    }
  });

  it("say an hour is shared whenever two pieces of a meter fall in it", () => {
    const next = random(11);
    for (let i = 0; i < 2_000; i++) {
      const rows = Array.from({ length: 1 + Math.floor(next() * 6) }, () =>
        reading(next, next() < 0.5 ? "m1" : "m2"),
      );
      const keys = rows.flatMap((r) =>
        piecesOf(r).map((p) => `${r.meter.id}|${p.start}`),
      );
      const shared = new Set(keys).size < keys.length;
      // Never a missed sharing, in any order…
      if (shared) expect(intervalPieces(rows).shared).toBe(true);
      // …and exact for readings in key order, as the store passes them.
      const sorted = [...rows].sort(
        (a, b) =>
          a.meter.id.localeCompare(b.meter.id) ||
          a.readingTime.getTime() - b.readingTime.getTime(),
      );
      expect(intervalPieces(sorted).shared).toBe(shared);
    }
  });

  it("list the pieces as column arrays with the hour range", () => {
    const r = reading(random(3));
    r.readingTime = new Date(T0 + 30 * 60_000);
    r.endTime = new Date(T0 + 150 * 60_000);
    const p = intervalPieces([r]);
    expect(p.starts).toEqual([
      "2026-03-29T00:00:00.000Z",
      "2026-03-29T01:00:00.000Z",
      "2026-03-29T02:00:00.000Z",
    ]);
    expect([p.from, p.to]).toEqual([T0, T0 + 2 * HOUR_MS]);
    expect(p.readingTimes).toEqual(Array(3).fill("2026-03-29T00:30:00.000Z"));
  });
});
