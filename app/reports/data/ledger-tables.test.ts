import { describe, expect, it } from "vitest";
import type { LedgerRow } from "~/ledger/ledger-rows.server";
import {
  carrierTables,
  monthStatuses,
  toEntry,
  totalOf,
} from "./ledger-tables";

function row(over: Partial<LedgerRow>): LedgerRow {
  return {
    site_id: "s1",
    site_name: "Site one",
    floor_area_m2: null,
    month: "2025-01",
    carrier: "heat",
    imports_kwh: "100.000000",
    exports_kwh: "0",
    net_kwh: "100.000000",
    estimated_kwh: "10.000000",
    estimated_share: 0.1,
    uncertainty_kwh: null,
    status: "open",
    adjustments_kwh: "0",
    adjustment_count: 0,
    closed_at: null,
    exergy_kwh: null,
    co2e_kg: null,
    co2e_market_kg: null,
    co2e_adjustments_kg: "0",
    co2e_market_adjustments_kg: "0",
    cost: null,
    currency: null,
    adjustments_cost: null,
    ...over,
  };
}

describe("ledger tables", () => {
  it("totals add exactly; the estimated share is over the energy metered in and out", () => {
    const total = totalOf(
      [
        row({}),
        row({
          month: "2025-02",
          imports_kwh: "50.5",
          exports_kwh: "-49.5",
          net_kwh: "1.0",
          estimated_kwh: "0",
          uncertainty_kwh: "2.25",
          adjustments_kwh: "-1.5",
          adjustment_count: 2,
        }),
      ].map(toEntry),
    );
    expect(total).toEqual({
      importsKwh: "150.500000",
      exportsKwh: "-49.5",
      netKwh: "101.000000",
      estimatedShare: 10 / 200,
      uncertaintyKwh: "2.25",
      adjustmentsKwh: "-1.5",
      adjustmentCount: 2,
      // No entry is priced: no cost total rather than a zero.
      cost: null,
      currency: null,
    });
  });

  it("the cost total is the exact sum of priced entries of one currency, and none across currencies", () => {
    const priced = [
      row({ cost: "0.1", currency: "GBP" }),
      row({ month: "2025-02", cost: "0.2", currency: "GBP" }),
    ].map(toEntry);
    expect(totalOf(priced)).toMatchObject({ cost: "0.3", currency: "GBP" });
    const mixed = [...priced, toEntry(row({ cost: "5", currency: "EUR" }))];
    expect(totalOf(mixed)).toMatchObject({ cost: null, currency: null });
  });

  it("one table per carrier, heat before electricity, months in order", () => {
    const tables = carrierTables(
      [
        row({ carrier: "electricity", month: "2025-02" }),
        row({ carrier: "electricity", month: "2025-01" }),
        row({ carrier: "heat" }),
      ].map(toEntry),
    );
    expect(tables.map((t) => t.carrier)).toEqual(["heat", "electricity"]);
    expect(tables[1].entries.map((e) => e.month)).toEqual([
      "2025-01",
      "2025-02",
    ]);
  });
});

describe("month status", () => {
  const months = ["2025-01", "2025-02", "2025-03"];
  const rows = [
    row({ site_id: "a", month: "2025-01", status: "closed" }),
    row({ site_id: "b", month: "2025-01", status: "closed" }),
    row({ site_id: "a", month: "2025-02", status: "closed" }),
    row({ site_id: "b", month: "2025-02", status: "open" }),
  ];

  it("for all sites: closed when every site with entries is, or the organisation closed it", () => {
    const statuses = monthStatuses({
      months,
      rows,
      closes: [{ siteId: null, month: "2025-03" }],
      siteId: null,
    });
    expect(statuses.map((s) => s.closed)).toEqual([true, false, true]);
    expect(statuses[1]).toMatchObject({ sitesWithEntries: 2, sitesClosed: 1 });
  });

  it("a month with no entries and no close is open", () => {
    const [march] = monthStatuses({
      months: ["2025-03"],
      rows,
      closes: [],
      siteId: null,
    });
    expect(march.closed).toBe(false);
  });

  it("for one site: its own close counts", () => {
    const statuses = monthStatuses({
      months,
      rows: rows.filter((r) => r.site_id === "b"),
      closes: [{ siteId: "b", month: "2025-03" }],
      siteId: "b",
    });
    expect(statuses.map((s) => s.closed)).toEqual([true, false, true]);
  });
});
