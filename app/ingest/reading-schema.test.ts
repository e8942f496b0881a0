import { describe, expect, it } from "vitest";
import { parseReading, parseWithSchemas } from "./reading-schema";

const NOW = new Date("2026-06-01T12:00:00Z");

const METERS: unknown[] = [
  "W-1",
  "  W-1 ",
  "",
  "   ",
  "x".repeat(64),
  "x".repeat(65),
  ` ${"x".repeat(64)} `,
  42,
  null,
  undefined,
];

const QUANTITIES: unknown[] = [
  "water_heat",
  "steam_heat",
  "electric_register",
  "heat_register",
  "gas_volume",
  "hydrogen",
  "WATER_HEAT",
  "gas",
  7,
  undefined,
];

const INSTANTS: unknown[] = [
  "2026-03-01T10:00:00Z",
  "2026-03-01T10:15:00.250Z",
  "2026-03-01T10:30:00.123456789Z",
  "2026-03-01T12:00:00+01:00",
  "2026-03-01T08:30:00-04:30",
  "2026-03-20T08:30:00-04:30",
  "2026-03-01T10:00Z",
  "2026-03-01T10:00:00",
  "2026-03-01 10:00:00Z",
  "2026-03-01T10:00:00z",
  "2026-03-01T10:00:00+0100",
  "2026-03-01T10:00:00+24:00",
  "2026-03-01T24:00:00Z",
  "2026-02-29T10:00:00Z",
  "2024-02-29T10:00:00Z",
  "2026-04-31T10:00:00Z",
  "1989-12-31T23:00:00Z",
  "2099-01-01T00:00:00Z",
  "2026-03-01T10:00:00.Z",
  1_772_359_200_000,
  undefined,
];

/** Every combination of the fields above; an unknown field on some. */
function* readings(): Generator<Record<string, unknown>> {
  for (const meter of METERS)
    for (const quantity of QUANTITIES)
      for (const [i, start] of INSTANTS.entries())
        for (const [j, end] of INSTANTS.entries()) {
          const extra = (i + j) % 3 === 0 ? { note: "x" } : {};
          yield { meter, quantity, start, end, volume_m3: 1, ...extra };
        }
}

describe("parseReading", () => {
  it("answers exactly as the schemas do, whichever path a reading takes", () => {
    let accepted = 0;
    let refused = 0;
    for (const raw of readings()) {
      const answer = parseReading(raw, NOW);
      expect(answer, JSON.stringify(raw)).toEqual(parseWithSchemas(raw, NOW));
      if (answer.ok) accepted++;
      else refused++;
    }
    // Both paths were exercised in numbers.
    expect(accepted).toBeGreaterThan(100);
    expect(refused).toBeGreaterThan(1_000);
    // Thousands of combinations: about 2 s alone, several times that when
    // the two cores are shared with the other suites' servers.
  }, 30_000);

  it("keeps the whole reading, except the meter, as the physics item", () => {
    const raw = {
      meter: " W-1 ",
      quantity: "water_heat",
      start: "2026-03-01T10:00:00Z",
      end: "2026-03-01T12:00:00+01:00",
      volume_m3: 2,
    };
    const parsed = parseReading(raw, NOW);
    expect(parsed).toEqual({
      ok: true,
      reading: {
        kind: "interval",
        meter: "W-1",
        quantity: "water_heat",
        start: new Date("2026-03-01T10:00:00Z"),
        end: new Date("2026-03-01T11:00:00Z"),
        item: {
          quantity: "water_heat",
          start: "2026-03-01T10:00:00Z",
          end: "2026-03-01T12:00:00+01:00",
          volume_m3: 2,
        },
      },
    });
    expect(parseReading({ ...raw, end: raw.start }, NOW)).toEqual({
      ok: false,
      error: "end: must be after start",
    });
  });
});

describe("text PostgreSQL cannot store", () => {
  const reading = (meter: string) => ({
    meter,
    quantity: "water_heat",
    start: "2026-03-01T10:00:00Z",
    end: "2026-03-01T11:00:00Z",
    volume_m3: 2,
  });

  it("refuses a meter code with NUL or a lone surrogate for that reading, by both paths", () => {
    for (const meter of ["W-1\u0000", "\u0000", "W-\uD800", "W-\uDC00x"]) {
      const expected = {
        ok: false,
        error:
          "meter: contains a NUL character or a lone UTF-16 surrogate, which cannot be stored",
      };
      expect(parseReading(reading(meter), NOW), meter).toEqual(expected);
      expect(parseWithSchemas(reading(meter), NOW), meter).toEqual(expected);
    }
  });

  it("accepts a code with a character outside the BMP (a surrogate pair)", () => {
    const parsed = parseReading(reading("W-\uD83D\uDE00"), NOW);
    expect(parsed.ok && parsed.reading.meter).toBe("W-\uD83D\uDE00");
  });
});
