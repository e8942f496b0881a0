import { describe, expect, it } from "vitest";
import { newestReadingsStatus } from "./freshness";

const now = new Date("2026-12-05T08:40:00Z");

describe("newestReadingsStatus", () => {
  it("says Live while the newest reading ended within two hours", () => {
    // The hour 07:00–08:00 ended 40 minutes ago.
    expect(
      newestReadingsStatus("2026-12-05T07:00:00Z", now, "Europe/London"),
    ).toEqual({ live: true, text: "Live" });
    // The hour 06:00–07:00 ended 1 h 40 min ago.
    expect(
      newestReadingsStatus("2026-12-05T06:00:00Z", now, "Europe/London").live,
    ).toBe(true);
  });

  it("says when the last reading came once it is older, in the site's time", () => {
    expect(
      newestReadingsStatus("2026-11-30T23:00:00Z", now, "Europe/London"),
    ).toEqual({
      live: false,
      text: "Last reading 4 days ago (1 Dec 2026, 00:00)",
    });
    // The hour 05:00–06:00 ended 2 h 40 min ago: no longer live.
    expect(
      newestReadingsStatus("2026-12-05T05:00:00Z", now, "Europe/London").text,
    ).toBe("Last reading 3 hours ago (5 Dec 2026, 06:00)");
    // A summer reading in London is shown in summer time.
    expect(
      newestReadingsStatus("2026-07-01T11:00:00Z", now, "Europe/London").text,
    ).toBe("Last reading 5 months ago (1 Jul 2026, 13:00)");
  });

  it("says there are none when the meter has no readings", () => {
    expect(newestReadingsStatus(null, now, "Europe/London")).toEqual({
      live: false,
      text: "No readings yet",
    });
  });
});
