import ExcelJS from "exceljs";
import Papa from "papaparse";
import { afterAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { createOrganization, pool } from "../support/db";
import { meterFormFields } from "../support/forms";

afterAll(() => pool.end());

/** Site names a spreadsheet would run as formulas if they went out as typed. */
const HOSTILE_NAMES = [
  '=HYPERLINK("http://evil.example","x")',
  "+SUM(1,2)",
  "-2+3+cmd|' /C calc'!A0",
  "@SUM(1+1)",
];

const meterFields = (code: string, orientation: "import" | "export") =>
  meterFormFields({ code, name: `Register ${code}`, orientation });

/**
 * A site with one electricity register and three hours of reads in May 2026,
 * through the pages and upload API an energy manager uses.
 */
async function addSiteWithReadings(
  manager: Client,
  orgId: string,
  name: string,
  code: string,
  orientation: "import" | "export",
) {
  const site = await manager.post(`/o/${orgId}/sites`, {
    intent: "save-site",
    name,
    timeZone: "Europe/London",
    floorAreaM2: "",
    degreeDayBaseC: "15.5",
    address: "",
  });
  expect(site.status, name).toBe(302);
  const siteId = site.headers.get("location")!.split("/").pop()!;
  const meter = await manager.post(
    `/o/${orgId}/sites/${siteId}/meters/new`,
    meterFields(code, orientation),
  );
  expect(meter.status, name).toBe(302);
  const reads = [100, 101.25, 103.5, 104.125].map((kwh, hour) => ({
    meter: code,
    quantity: "electric_register",
    time: `2026-05-01T0${hour}:00:00Z`,
    register_kwh: kwh,
  }));
  const upload = await manager.postJson(`/api/v1/orgs/${orgId}/readings`, {
    readings: reads,
  });
  expect(await upload.json()).toMatchObject({ accepted: 4, rejected: [] });
}

type LedgerRow = { site_name: string; exports_kwh: string; net_kwh: string };

describe("ledger exports and formula injection", () => {
  it("site names starting with = + - @ leave as text in CSV and XLSX; numbers stay numbers", async () => {
    const org = await createOrganization(["energy_manager"]);
    const manager = new Client();
    await manager.signIn(org.members[0].email, org.members[0].password);
    for (const [i, name] of HOSTILE_NAMES.entries()) {
      // The "-" site exports, so its row carries negative kWh beside the name.
      const orientation = name.startsWith("-") ? "export" : "import";
      await addSiteWithReadings(
        manager,
        org.id,
        name,
        `F${i}-${org.id.slice(0, 8)}`,
        orientation,
      );
    }
    const query = "from=2026-05&to=2026-05";
    const json = (await (
      await manager.get(`/api/v1/orgs/${org.id}/ledger?${query}`)
    ).json()) as { rows: LedgerRow[] };
    const byName = new Map(json.rows.map((r) => [r.site_name, r]));
    expect([...byName.keys()].sort()).toEqual([...HOSTILE_NAMES].sort());
    const exporter = byName.get(HOSTILE_NAMES[2])!;
    expect(Number(exporter.exports_kwh)).toBeLessThan(0);

    // CSV: each name comes back with a leading ' (text to a spreadsheet).
    const csvResponse = await manager.get(
      `/api/v1/orgs/${org.id}/ledger.csv?${query}`,
    );
    expect(csvResponse.status).toBe(200);
    const csv = Papa.parse<Record<string, string>>(await csvResponse.text(), {
      header: true,
      skipEmptyLines: true,
    });
    expect(csv.errors).toEqual([]);
    const entries = csv.data.filter((r) => r.Site !== "Total");
    expect(entries.map((r) => r.Site).sort()).toEqual(
      HOSTILE_NAMES.map((n) => `'${n}`).sort(),
    );
    const exporterCsv = entries.find((r) => r.Site === `'${HOSTILE_NAMES[2]}`)!;
    // Negative figures stay plain numbers, not neutralised text.
    expect(exporterCsv["Exported (kWh)"]).toMatch(/^-\d+(\.\d+)?$/);
    expect(Number(exporterCsv["Exported (kWh)"])).toBe(
      Number(exporter.exports_kwh),
    );
    expect(Number(exporterCsv["Net (kWh)"])).toBe(Number(exporter.net_kwh));

    // XLSX: each name is a plain string cell in a text-formatted column, not a formula.
    const xlsxResponse = await manager.get(
      `/api/v1/orgs/${org.id}/ledger.xlsx?${query}`,
    );
    expect(xlsxResponse.status).toBe(200);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await xlsxResponse.arrayBuffer());
    const sheet = book.getWorksheet("Ledger")!;
    const headers = sheet.getRow(1).values as unknown[];
    const siteColumn = headers.indexOf("Site");
    const exportsColumn = headers.indexOf("Exported (kWh)");
    const siteCells = HOSTILE_NAMES.map((name) => {
      const rows: ExcelJS.Row[] = [];
      sheet.eachRow((row) => {
        if (row.getCell(siteColumn).text === name) rows.push(row);
      });
      expect(rows, name).toHaveLength(1);
      return rows[0];
    });
    for (const [i, row] of siteCells.entries()) {
      const cell = row.getCell(siteColumn);
      expect(cell.type, HOSTILE_NAMES[i]).toBe(ExcelJS.ValueType.String);
      expect(cell.value).toBe(HOSTILE_NAMES[i]);
      expect(cell.formula).toBeUndefined();
      expect(cell.numFmt, HOSTILE_NAMES[i]).toBe("@");
    }
    const exportsCell = siteCells[2].getCell(exportsColumn);
    expect(exportsCell.type).toBe(ExcelJS.ValueType.Number);
    expect(exportsCell.value).toBe(Number(exporter.exports_kwh));
  });
});
