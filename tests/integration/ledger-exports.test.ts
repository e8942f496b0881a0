/**
 * The ledger's CSV and XLSX files follow the screen: the unit chosen on the
 * Ledger page, readable headings, the ± uncertainty column, exact decimals and
 * one total row per carrier. The JSON API keeps its machine field names.
 */
import { eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db, pool, schema } from "../support/db";
import { estimationSettled } from "../support/estimation";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());

interface JsonLedger {
  rows: {
    site_name: string;
    month: string;
    carrier: string;
    imports_kwh: string;
    exports_kwh: string;
    net_kwh: string;
    uncertainty_kwh: string | null;
  }[];
  totals: {
    carrier: string;
    imports_kwh: string;
    exports_kwh: string;
    net_kwh: string;
  }[];
}

/**
 * A decimal text × 10^-places, exactly, without trailing zeros: the test's
 * own arithmetic (BigInt), independent of the app's.
 */
function shifted(value: string, places: number, times = 1n): string {
  const [, sign, whole, fraction = ""] = /^(-?)(\d+)(?:\.(\d+))?$/.exec(value)!;
  const digits = BigInt(whole + fraction) * times;
  const scale = fraction.length + places;
  const text = digits.toString().padStart(scale + 1, "0");
  const result =
    `${text.slice(0, text.length - scale)}.${text.slice(text.length - scale)}`
      .replace(/0+$/, "")
      .replace(/\.$/, "");
  return result === "0" ? "0" : `${sign}${result}`;
}
const inMWh = (kwh: string) => shifted(kwh, 3);
/** 1 kWh = 3.6 MJ exactly, so × 36 ÷ 10^4 into GJ. */
const inGJ = (kwh: string) => shifted(kwh, 4, 36n);

const carrierLabel: Record<string, string> = {
  heat: "Heat",
  electricity: "Electricity",
};

let org: MeteredOrg;
let manager: Client;
let json: JsonLedger;
const query = "from=2026-07&to=2026-08";

beforeAll(async () => {
  org = await createMeteredOrg({ roles: ["energy_manager"] });
  // A rated heat meter, so its entries carry an EN 1434 band.
  await db
    .update(schema.meters)
    .set({ accuracyClass: 2, deltaThetaMinK: "3", qpM3PerH: "2.5" })
    .where(eq(schema.meters.id, org.meters.water.id));
  const register = (code: string, time: string, kwh: number) => ({
    meter: code,
    quantity: "electric_register",
    time,
    register_kwh: kwh,
  });
  const readings = [
    {
      meter: org.meters.water.code,
      quantity: "water_heat",
      start: "2026-07-01T10:00:00Z",
      end: "2026-07-01T11:00:00Z",
      volume_m3: 2.345,
      flow_temp_c: 75.3,
      return_temp_c: 50.1,
    },
    register(org.meters.register.code, "2026-07-02T00:00:00Z", 1000.125),
    register(org.meters.register.code, "2026-07-02T01:00:00Z", 1012.468),
    register(org.meters.register.code, "2026-08-02T01:00:00Z", 1234.567),
    register(org.meters.register.code, "2026-08-02T02:00:00Z", 1333.891),
    register(org.meters.export.code, "2026-08-02T01:00:00Z", 50.5),
    register(org.meters.export.code, "2026-08-02T02:00:00Z", 57.129),
  ];
  const posted = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(posted.status).toBe(200);
  // The month between the register reads is gap-filled after the answer:
  // every figure below is read once it has settled.
  await estimationSettled(org.org.id);
  manager = new Client();
  await manager.signIn(org.org.members[0].email, org.org.members[0].password);
  const answer = await manager.get(
    `/api/v1/orgs/${org.org.id}/ledger?${query}`,
  );
  expect(answer.status).toBe(200);
  json = (await answer.json()) as JsonLedger;
  expect(json.rows).toHaveLength(3);
});

async function csvOf(params: string) {
  const response = await manager.get(
    `/api/v1/orgs/${org.org.id}/ledger.csv?${params}`,
  );
  expect(response.status).toBe(200);
  const parsed = Papa.parse<Record<string, string>>(await response.text(), {
    header: true,
    skipEmptyLines: true,
  });
  expect(parsed.errors).toEqual([]);
  return { response, ...parsed };
}

describe("ledger exports", () => {
  it("CSV in the chosen unit: readable headings, the ± uncertainty column, exact decimals", async () => {
    const { data, meta, response } = await csvOf(`${query}&unit=MWh`);
    expect(meta.fields).toEqual([
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
    expect(response.headers.get("content-disposition")).toContain(
      "joulebook-ledger-2026-07-to-2026-08-MWh.csv",
    );
    const entries = data.filter((l) => l.Site !== "Total");
    expect(entries).toHaveLength(json.rows.length);
    for (const row of json.rows) {
      const line = entries.find(
        (l) => l.Month === row.month && l.Carrier === carrierLabel[row.carrier],
      )!;
      expect(line, `${row.month} ${row.carrier}`).toBeDefined();
      expect(line["Delivered (MWh)"]).toBe(inMWh(row.imports_kwh));
      expect(line["Exported (MWh)"]).toBe(inMWh(row.exports_kwh));
      expect(line["Net (MWh)"]).toBe(inMWh(row.net_kwh));
      expect(line["± uncertainty (MWh)"]).toBe(
        row.uncertainty_kwh === null ? "" : inMWh(row.uncertainty_kwh),
      );
      expect(line.Status).toBe("Open");
    }
    const heat = entries.find((l) => l.Carrier === "Heat")!;
    expect(Number(heat["± uncertainty (MWh)"])).toBeGreaterThan(0);
  });

  it("CSV ends with one total row per carrier, never one over carriers", async () => {
    const { data } = await csvOf(`${query}&unit=GJ`);
    const totals = data.filter((l) => l.Site === "Total");
    expect(totals.map((t) => t.Carrier)).toEqual(["Heat", "Electricity"]);
    expect(data.slice(-2)).toEqual(totals);
    for (const total of json.totals) {
      const line = totals.find(
        (t) => t.Carrier === carrierLabel[total.carrier],
      )!;
      expect(line["Delivered (GJ)"]).toBe(inGJ(total.imports_kwh));
      expect(line["Exported (GJ)"]).toBe(inGJ(total.exports_kwh));
      expect(line["Net (GJ)"]).toBe(inGJ(total.net_kwh));
      expect(line.Month).toBe("");
    }
    // Two months of electricity add into its total; nothing adds heat to it.
    const electricity = json.rows.filter((r) => r.carrier === "electricity");
    expect(electricity).toHaveLength(2);
  });

  it("CSV without a unit is in kWh, and a unit the page does not offer is refused", async () => {
    const { meta, data } = await csvOf(query);
    expect(meta.fields).toContain("Delivered (kWh)");
    const row = json.rows[0];
    const line = data.find(
      (l) => l.Month === row.month && l.Carrier === carrierLabel[row.carrier],
    )!;
    expect(line["Delivered (kWh)"]).toBe(shifted(row.imports_kwh, 0));
    for (const bad of ["unit=BTU", "unit=", "per=ft2"]) {
      const refused = await manager.get(
        `/api/v1/orgs/${org.org.id}/ledger.csv?${query}&${bad}`,
      );
      expect(refused.status, bad).toBe(400);
      expect(await refused.json()).toMatchObject({
        error: { code: "invalid_body" },
      });
    }
  });

  it("XLSX: number formats per unit, months as dates, bold total rows, a Notes sheet", async () => {
    const response = await manager.get(
      `/api/v1/orgs/${org.org.id}/ledger.xlsx?${query}&unit=MWh`,
    );
    expect(response.status).toBe(200);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await response.arrayBuffer());
    const sheet = book.getWorksheet("Ledger")!;
    const headers = (sheet.getRow(1).values as unknown[]).slice(1);
    expect(headers).toContain("± uncertainty (MWh)");
    const column = (name: string) => headers.indexOf(name) + 1;
    const entry = sheet.getRow(2);
    expect(entry.getCell(column("Delivered (MWh)")).numFmt).toBe("#,##0.000");
    expect(entry.getCell(column("± uncertainty (MWh)")).numFmt).toBe(
      '"±"#,##0.000',
    );
    expect(entry.getCell(column("Month")).value).toEqual(
      new Date(Date.UTC(2026, 6, 1)),
    );
    expect(entry.getCell(column("Month")).numFmt).toBe("mmm yyyy");
    expect(entry.font?.bold).toBeFalsy();
    const last = sheet.rowCount;
    const totals = [sheet.getRow(last - 1), sheet.getRow(last)];
    expect(totals.map((r) => r.getCell(column("Site")).value)).toEqual([
      "Total",
      "Total",
    ]);
    expect(totals.map((r) => r.getCell(column("Carrier")).value)).toEqual([
      "Heat",
      "Electricity",
    ]);
    for (const row of totals) {
      expect(row.getCell(column("Delivered (MWh)")).font?.bold).toBe(true);
      expect(row.getCell(column("Delivered (MWh)")).type).toBe(
        ExcelJS.ValueType.Number,
      );
    }
    const heatTotal = json.totals.find((t) => t.carrier === "heat")!;
    expect(totals[0].getCell(column("Delivered (MWh)")).value).toBe(
      Number(inMWh(heatTotal.imports_kwh)),
    );
    const notes = book.getWorksheet("Notes")!;
    const text = JSON.stringify(notes.getSheetValues());
    expect(text).toContain("2026-07 to 2026-08");
    expect(text).toContain("3600 MJ");

    const therms = await manager.get(
      `/api/v1/orgs/${org.org.id}/ledger.xlsx?${query}&unit=therm`,
    );
    const thermBook = new ExcelJS.Workbook();
    await thermBook.xlsx.load(await therms.arrayBuffer());
    const thermSheet = thermBook.getWorksheet("Ledger")!;
    expect((thermSheet.getRow(1).values as unknown[]).slice(1)).toContain(
      "Delivered (therm)",
    );
    expect(thermSheet.getRow(2).getCell(4).numFmt).toBe("#,##0.0");
  });

  it("the JSON ledger keeps its machine field names and its kWh", async () => {
    expect(Object.keys(json.rows[0]).sort()).toEqual(
      [
        "site_id",
        "site_name",
        "floor_area_m2",
        "month",
        "carrier",
        "imports_kwh",
        "exports_kwh",
        "net_kwh",
        "estimated_kwh",
        "estimated_share",
        "exergy_kwh",
        "uncertainty_kwh",
        "status",
        "adjustments_kwh",
        "adjustment_count",
        "closed_at",
        "co2e_kg",
        "co2e_market_kg",
        "co2e_adjustments_kg",
        "co2e_market_adjustments_kg",
        // Cost beside the energy (docs/costs.md): null where no tariff applies.
        "cost",
        "currency",
        "adjustments_cost",
      ].sort(),
    );
  });
});
