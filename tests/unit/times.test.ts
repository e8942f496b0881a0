import { describe, expect, it } from "vitest";
import { dateTimeUtc, dayUtc, timeAgo } from "../../app/lib/times";

describe("times on pages", () => {
  it("measures a relative time from the given now, not from the clock", () => {
    const now = "2026-03-01T12:00:00Z";
    expect(timeAgo("2026-03-01T11:56:00Z", now)).toBe("4 minutes ago");
    expect(timeAgo("2026-02-27T12:00:00Z", now)).toBe("2 days ago");
    expect(timeAgo(new Date("2026-03-01T12:00:30Z"), now)).toBe(
      "in 30 seconds",
    );
  });

  it("writes absolute times in UTC whatever the machine's zone", () => {
    // 23:30 UTC is already the next day in London summer time and Asia.
    const late = "2026-06-30T23:30:00Z";
    expect(dayUtc(late)).toBe("30 Jun 2026");
    expect(dateTimeUtc(late)).toBe("30 Jun 2026, 23:30 UTC");
    expect(dateTimeUtc("2026-01-05T03:04:05Z", { seconds: true })).toBe(
      "5 Jan 2026, 03:04:05 UTC",
    );
  });
});
