import { describe, expect, it } from "vitest";
import { readCsv } from "~/ingest/supplier-files/read-csv";
import { billMonths, compareBill, DEFAULT_TOLERANCE } from "./bill-check";
import { readBillSheet } from "./bill-file";

describe("a bill's period", () => {
  it("covers whole months, across a year end", () => {
    expect(billMonths("2025-11-01", "2026-02-28")).toEqual({
      ok: true,
      months: ["2025-11", "2025-12", "2026-01", "2026-02"],
    });
    expect(billMonths("2024-02-01", "2024-02-29")).toEqual({
      ok: true,
      months: ["2024-02"],
    });
  });
  it("refuses a part month or a reversed period with the reason", () => {
    const mid = billMonths("2025-03-15", "2025-04-30");
    expect(mid.ok).toBe(false);
    expect(!mid.ok && mid.reason).toMatch(/not the first day of a month/);
    const short = billMonths("2025-03-01", "2025-04-29");
    expect(!short.ok && short.reason).toMatch(/not the last day of a month/);
    expect(billMonths("2023-02-01", "2023-02-29").ok).toBe(false);
    expect(billMonths("2025-05-01", "2025-04-30").ok).toBe(false);
  });
});

describe("setting a bill against the meters and the tariff", () => {
  const base = { meteredKwh: "1000", computedCost: "250.00" };

  it("agrees within 2 % by default, exactly at the edge, and queries beyond it", () => {
    expect(
      compareBill({
        ...base,
        kwh: "1020",
        amount: "255.00",
        tolerance: DEFAULT_TOLERANCE,
      }),
    ).toMatchObject({
      state: "agreed",
      kwhDifference: "20",
      amountDifference: "5",
      reasons: [],
    });
    const over = compareBill({
      ...base,
      kwh: "1020.000001",
      amount: "250",
      tolerance: DEFAULT_TOLERANCE,
    });
    expect(over.state).toBe("queried");
    expect(over.reasons).toEqual([
      "kWh differ from the meters by 20.000001 (allowed 20)",
    ]);
    const dearer = compareBill({
      ...base,
      kwh: "1000",
      amount: "244.99",
      tolerance: DEFAULT_TOLERANCE,
    });
    expect(dearer.state).toBe("queried");
    expect(dearer.amountDifference).toBe("-5.01");
  });

  it("takes the larger of the percentage and the absolute allowance", () => {
    const tolerance = { percent: "1", absoluteKwh: "50", absoluteAmount: "1" };
    expect(
      compareBill({ ...base, kwh: "1050", amount: "252.50", tolerance }).state,
    ).toBe("agreed");
    expect(
      compareBill({ ...base, kwh: "1051", amount: "250", tolerance }).state,
    ).toBe("queried");
    const onlyAbsolute = {
      percent: null,
      absoluteKwh: "0",
      absoluteAmount: "0",
    };
    expect(
      compareBill({
        ...base,
        kwh: "1000",
        amount: "250",
        tolerance: onlyAbsolute,
      }).state,
    ).toBe("agreed");
    expect(
      compareBill({
        ...base,
        kwh: "1000.000001",
        amount: "250",
        tolerance: onlyAbsolute,
      }).state,
    ).toBe("queried");
  });
});

describe("a bill file", () => {
  it("reads the columns in any order and case, and lists each bad row", () => {
    const good = readBillSheet(
      readCsv(
        "Read_Type,supply,period_from,period_to,kWh,amount\nActual,EL-1,2025-01-01,2025-01-31,1200.5,310.20\n",
      ),
    );
    expect(good).toEqual({
      ok: true,
      rows: [
        {
          row: 2,
          bill: {
            supply: "EL-1",
            period_from: "2025-01-01",
            period_to: "2025-01-31",
            kwh: "1200.5",
            amount: "310.20",
            read_type: "actual",
          },
        },
      ],
    });
    const bad = readBillSheet(
      readCsv(
        "supply,period_from,period_to,kwh,amount,read_type\nEL-1,2025-02-30,2025-03-31,12,3,actual\nEL-1,2025-01-01,2025-01-31,lots,3,guess\n",
      ),
    );
    expect(bad.ok).toBe(false);
    expect(!bad.ok && bad.problems.map((p) => p.row)).toEqual([2, 3]);
    expect(!bad.ok && bad.problems[1].reason).toMatch(
      /kwh: a number.*read_type: actual or estimated/,
    );
    const noColumn = readBillSheet(readCsv("supply,kwh\nEL-1,3\n"));
    expect(!noColumn.ok && noColumn.problems[0].reason).toMatch(
      /Missing columns: period_from, period_to, amount, read_type/,
    );
  });
});
