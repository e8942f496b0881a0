import { describe, expect, it } from "vitest";
import { clockChangeNotes } from "./clock-change-days";

const at = (iso: string) => Date.parse(iso);

describe("clockChangeNotes", () => {
  it("explains London's autumn day as 50 half-hours and its spring day as 46", () => {
    const notes = clockChangeNotes(
      at("2026-01-01T00:00:00Z"),
      at("2026-12-31T23:30:00Z"),
      "Europe/London",
      30,
    );
    expect(notes).toEqual([
      "29/03/2026: the clocks go forward an hour in Europe/London, so the day has 46 half-hours, not 48. A one-row-per-day file leaves the missing times blank or gives the 46 values in order.",
      "25/10/2026: the clocks go back an hour in Europe/London, so the day has 50 half-hours, not 48; the repeated times come twice, in order.",
    ]);
  });

  it("counts hours for an hourly file and says nothing of days outside the file", () => {
    const notes = clockChangeNotes(
      at("2026-10-24T00:00:00Z"),
      at("2026-10-26T23:00:00Z"),
      "Europe/London",
      60,
    );
    expect(notes).toHaveLength(1);
    expect(notes[0]).toMatch(/^25\/10\/2026: .* 25 hours, not 24/);
    expect(
      clockChangeNotes(
        at("2026-11-01T00:00:00Z"),
        at("2026-11-30T00:00:00Z"),
        "Europe/London",
        30,
      ),
    ).toEqual([]);
  });

  it("has nothing to say for a zone without clock changes", () => {
    expect(
      clockChangeNotes(
        at("2026-01-01T00:00:00Z"),
        at("2026-12-31T00:00:00Z"),
        "UTC",
        30,
      ),
    ).toEqual([]);
  });
});
