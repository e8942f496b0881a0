import { describe, expect, it } from "vitest";
import {
  exportFilename,
  ledgerExport,
  type ExportableLedger,
} from "./ledger-export";

const entry = (
  site: string,
  month: string,
  carrier: string,
  imports: string,
  exports: string,
  extra: Partial<ExportableLedger["rows"][number]> = {},
): ExportableLedger["rows"][number] => ({
  site_id: `id-${site}`,
  site_name: site,
  floor_area_m2: "1000.00",
  month,
  carrier,
  imports_kwh: imports,
  exports_kwh: exports,
  net_kwh: String(Number(imports) + Number(exports)),
  estimated_kwh: "0",
  estimated_share: 0,
  uncertainty_kwh: null,
  status: "open",
  adjustments_kwh: "0",
  adjustment_count: 0,
  ...extra,
});

const ledger: ExportableLedger = {
  from: "2026-01",
  to: "2026-02",
  rows: [
    entry("Civic Hall", "2026-01", "heat", "1500.250000", "0", {
      uncertainty_kwh: "52.500000",
      estimated_kwh: "150.025000",
      estimated_share: 0.1,
      status: "closed",
      cost: "165.0275",
      currency: "GBP",
    }),
    entry("Civic Hall", "2026-01", "electricity", "800.000000", "-120.500000"),
    entry("Pool", "2026-02", "heat", "2000.000000", "0", {
      uncertainty_kwh: "70.000000",
      floor_area_m2: null,
    }),
  ],
  totals: [
    {
      carrier: "electricity",
      imports_kwh: "800.000000",
      exports_kwh: "-120.500000",
      net_kwh: "679.500000",
    },
    {
      carrier: "heat",
      imports_kwh: "3500.250000",
      exports_kwh: "0",
      net_kwh: "3500.250000",
      cost: "165.0275",
      currency: "GBP",
    },
  ],
};

describe("the ledger export table", () => {
  it("has readable headings in the chosen unit, the ± uncertainty among them", () => {
    const table = ledgerExport(ledger, { unit: "MWh", perM2: false });
    expect(table.columns.map((c) => c.header)).toEqual([
      "Site",
      "Month",
      "Carrier",
      "Delivered (MWh)",
      "Exported (MWh)",
      "Net (MWh)",
      "Estimated (MWh)",
      "Estimated share (%)",
      "± uncertainty (MWh)",
      "Adjustments (MWh)",
      "Adjustment count",
      "Cost",
      "Currency",
      "Status",
      "CO₂e location-based (kg)",
      "CO₂e market-based (kg)",
    ]);
    expect(table.lines[0]).toEqual({
      total: false,
      cells: [
        "Civic Hall",
        "2026-01",
        "Heat",
        "1.50025",
        "0",
        "1.50025",
        "0.150025",
        10,
        "0.0525",
        "0",
        0,
        // Money stays the exact decimal it was priced at, whatever the energy unit.
        "165.0275",
        "GBP",
        "Closed",
        null,
        null,
      ],
    });
  });

  it("ends with one total row per carrier, in carrier order, never one over carriers", () => {
    const table = ledgerExport(ledger, { unit: "kWh", perM2: false });
    const totals = table.lines.filter((l) => l.total);
    expect(totals.map((t) => [t.cells[0], t.cells[2]])).toEqual([
      ["Total", "Heat"],
      ["Total", "Electricity"],
    ]);
    const [heat, electricity] = totals.map((t) => t.cells);
    expect(heat.slice(3, 10)).toEqual([
      "3500.25",
      "0",
      "3500.25",
      "150.025",
      // 150.025 of 3500.25 kWh metered.
      4.29,
      "122.5",
      "0",
    ]);
    expect(electricity.slice(3, 6)).toEqual(["800", "-120.5", "679.5"]);
    // The carrier's cost total is the API's exact sum; none where no row is priced.
    expect(heat.slice(11, 13)).toEqual(["165.0275", "GBP"]);
    expect(electricity.slice(11, 13)).toEqual([null, null]);
    expect(table.lines.filter((l) => !l.total)).toHaveLength(3);
  });

  it("per m² divides by the floor area, leaving out a site without one and its carrier's total", () => {
    const table = ledgerExport(ledger, { unit: "kWh", perM2: true });
    expect(table.columns[3].header).toBe("Floor area (m²)");
    expect(table.columns[4].header).toBe("Delivered (kWh/m²)");
    const [civicHeat, , pool, heatTotal, electricityTotal] = table.lines;
    expect(civicHeat.cells.slice(3, 5)).toEqual(["1000.00", "1.50025"]);
    expect(pool.cells.slice(3, 5)).toEqual([null, null]);
    expect(heatTotal.cells.slice(3, 5)).toEqual([null, null]);
    expect(electricityTotal.cells.slice(3, 6)).toEqual([
      "1000",
      "0.8",
      "-0.1205",
    ]);
  });

  it("names the file after the period and the view", () => {
    expect(exportFilename(ledger, { unit: "therm", perM2: true }, "xlsx")).toBe(
      "joulebook-ledger-2026-01-to-2026-02-therm-per-m2.xlsx",
    );
  });
});
