import { describe, expect, it } from "vitest";
import {
  defaultMonths,
  MAX_LEDGER_MONTHS,
  periodErrors,
} from "~/ledger/ledger-period";

describe("the Ledger page's months", () => {
  it("defaults to the twelve full months before today, across a year end", () => {
    expect(defaultMonths(new Date("2026-01-15T10:00:00Z"))).toEqual({
      from: "2025-01",
      to: "2025-12",
    });
  });

  it("accepts a period the API answers", () => {
    expect(periodErrors("2025-01", "2025-12")).toEqual({
      fromError: undefined,
      toError: undefined,
    });
  });

  it("says which end is wrong, and why", () => {
    expect(periodErrors("2025-13", "2025-12").fromError).toBe(
      "Use a month like 2025-01.",
    );
    expect(periodErrors("2025-06", "2025-05").toError).toBe(
      "The last month comes before the first.",
    );
    // An unusable first month leaves the last one's check for later.
    expect(periodErrors("nonsense", "2025-05").toError).toBeUndefined();
  });

  it("refuses more months than the API answers at once", () => {
    expect(periodErrors("2015-01", "2024-12").toError).toBeUndefined();
    expect(periodErrors("2015-01", "2025-01").toError).toBe(
      `Choose at most ${MAX_LEDGER_MONTHS} months at a time.`,
    );
  });
});
