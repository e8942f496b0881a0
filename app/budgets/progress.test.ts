import { describe, expect, it } from "vitest";
import { budgetProgress } from "./progress";

const months = ["2025-04", "2025-05", "2025-06", "2025-07"];

describe("budget progress", () => {
  it("keeps the actuals to date and scales the months to come by the year-to-date ratio", () => {
    const p = budgetProgress(
      months.map((month, i) => ({
        month,
        budget: ["100", "200", "300", "400"][i],
        actual: ["110", "220", null, null][i],
      })),
      "2025-05",
      2,
    );
    expect(p.actualToDate).toBe("330.00");
    expect(p.budgetToDate).toBe("300.00");
    expect(p.ratio).toBe("1.1");
    expect(p.months.map((m) => m.forecast)).toEqual([
      "110.00",
      "220.00",
      "330.00",
      "440.00",
    ]);
    expect(p.forecast).toBe("1100.00");
    expect(p.budget).toBe("1000.00");
  });

  it("before the year starts the forecast is the budget", () => {
    const p = budgetProgress(
      months.map((month) => ({ month, budget: "0.333", actual: null })),
      "2025-03",
      3,
    );
    expect(p.ratio).toBeNull();
    expect(p.forecast).toBe("1.332");
  });
});
