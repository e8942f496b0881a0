import { describe, expect, it } from "vitest";
import { monthLong } from "~/lib/format";
import { monthRange } from "~/lib/months";

describe("months in words and as instants", () => {
  it("names a month in full, whatever the machine's time zone", () => {
    expect(monthLong("2025-01")).toBe("January 2025");
    expect(monthLong("2026-12")).toBe("December 2026");
  });

  it("gives the UTC instants a month runs between, the next month's start excluded", () => {
    expect(monthRange("2025-12")).toEqual({
      from: "2025-12-01T00:00:00.000Z",
      to: "2026-01-01T00:00:00.000Z",
    });
  });

  it("gives no range for an empty or malformed month", () => {
    expect(monthRange("")).toBeNull();
    expect(monthRange("2025-1")).toBeNull();
  });
});
