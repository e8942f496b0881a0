import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { columnLabel, columnLetter } from "./columns";
import { readCsv } from "./read-csv";
import { plainCell, readXlsx } from "./read-xlsx";
import { readXlsxStream } from "./read-xlsx-stream.server";
import { toTable } from "./table";

describe("readCsv", () => {
  it("numbers rows as a spreadsheet shows them, blank lines left out but counted", () => {
    const sheet = readCsv(
      "meter,start,energy_kwh\r\nCH-EL1,01/04/2026 00:00,12.5\r\n\r\nCH-EL1,01/04/2026 00:30,11\r\n",
    );
    expect(sheet.rows.map((r) => r.number)).toEqual([1, 2, 4]);
    expect(sheet.rows[2].cells).toEqual(["CH-EL1", "01/04/2026 00:30", "11"]);
  });

  it("keeps quoted thousands together, drops a byte-order mark, and finds a semicolon delimiter", () => {
    expect(readCsv('\uFEFFmeter,kwh\nA,"1,234.5"\n').rows).toEqual([
      { number: 1, cells: ["meter", "kwh"] },
      { number: 2, cells: ["A", "1,234.5"] },
    ]);
    expect(readCsv("meter;kwh\nA;12.5\n").rows[1].cells).toEqual(["A", "12.5"]);
    // A blank line once made papaparse guess a comma for a semicolon file.
    expect(readCsv("meter;kwh\r\nA;12.5\r\n\r\nB;3\r\n").rows[2]).toEqual({
      number: 4,
      cells: ["B", "3"],
    });
  });
});

describe("toTable", () => {
  it("takes the first row as the header, or the row named, skipping lines above it", () => {
    const sheet = readCsv("Account 1234,,\nmeter,start,kWh\nA,x,1\n");
    expect(toTable(sheet)?.header).toEqual(["Account 1234", "", ""]);
    const table = toTable(sheet, 2);
    expect(table).toMatchObject({
      header: ["meter", "start", "kWh"],
      headerRowNumber: 2,
    });
    expect(table?.rows.map((r) => r.number)).toEqual([3]);
    expect(toTable(readCsv(""))).toBeNull();
  });
});

describe("columns", () => {
  it("letters columns as spreadsheets do: A, Z, AA, AZ, BA", () => {
    expect([0, 25, 26, 51, 52, 701, 702].map(columnLetter)).toEqual([
      "A",
      "Z",
      "AA",
      "AZ",
      "BA",
      "ZZ",
      "AAA",
    ]);
  });

  it("names a column by its header, or its letter when the header is blank", () => {
    expect(columnLabel(["meter", " "], 0)).toBe("meter");
    expect(columnLabel(["meter", " "], 1)).toBe("B");
    expect(columnLabel(["meter"], 50)).toBe("AY");
  });
});

async function workbookBytes(
  fill: (wb: ExcelJS.Workbook) => void,
): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  fill(wb);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe("readXlsx", () => {
  it("reads text, numbers, date cells (as wall-clock Dates), raw serials and formula results", async () => {
    const bytes = await workbookBytes((wb) => {
      const ws = wb.addWorksheet("Half-hours");
      ws.addRow(["meter", "start", "energy_kwh"]);
      const row = ws.addRow(["CH-EL1", new Date("2026-10-25T01:30:00Z"), 12.5]);
      row.getCell(2).numFmt = "dd/mm/yyyy hh:mm";
      // A date typed into a General cell: the serial of 29/03/2026 00:30.
      ws.addRow(["CH-EL1", 46110 + 1 / 48, { formula: "B3*0", result: 7.25 }]);
    });
    const result = await readXlsx(bytes);
    if ("error" in result) throw new Error(result.error);
    expect(result.sheetNames).toEqual(["Half-hours"]);
    expect(result.sheet.date1904).toBe(false);
    const [header, dated, serial] = result.sheet.rows;
    expect(header).toEqual({
      number: 1,
      cells: ["meter", "start", "energy_kwh"],
    });
    expect(dated.cells[1]).toEqual(new Date("2026-10-25T01:30:00Z"));
    expect(serial.cells).toEqual(["CH-EL1", 46110 + 1 / 48, 7.25]);
  });

  it("keeps row numbers across empty rows and picks a worksheet by name or position", async () => {
    const bytes = await workbookBytes((wb) => {
      wb.addWorksheet("Notes").addRow(["not this one"]);
      const ws = wb.addWorksheet("Data");
      ws.getCell("A1").value = "meter";
      ws.getCell("A4").value = "NP-EL1";
      ws.getCell("C4").value = 3;
    });
    const byName = await readXlsx(bytes, { sheet: "Data" });
    const byPosition = await readXlsx(bytes, { sheet: 2 });
    if ("error" in byName) throw new Error(byName.error);
    expect(byName.sheet.rows).toEqual([
      { number: 1, cells: ["meter"] },
      { number: 4, cells: ["NP-EL1", null, 3] },
    ]);
    expect(byPosition).toEqual(byName);
    expect(await readXlsx(bytes, { sheet: "Missing" })).toEqual({
      error: 'The workbook has no worksheet "Missing"; it has Notes, Data.',
    });
  });

  it("answers an error, not an exception, for bytes that are not a workbook", async () => {
    expect(await readXlsx(new TextEncoder().encode("meter,start\n"))).toEqual({
      error: "The file could not be read as an Excel workbook (.xlsx).",
    });
  });

  it("reduces exceljs's rich text, hyperlink and error values to plain cells", () => {
    expect(plainCell({ richText: [{ text: "CH-" }, { text: "EL1" }] })).toBe(
      "CH-EL1",
    );
    expect(
      plainCell({ text: "NP-EL1", hyperlink: "https://example.org" }),
    ).toBe("NP-EL1");
    expect(plainCell({ error: "#N/A" })).toBe("#N/A");
    expect(plainCell({ formula: "A1" })).toBeNull();
    expect(plainCell(undefined)).toBeNull();
  });
});

describe("readXlsxStream (server)", () => {
  it("gives the same rows as readXlsx: text, date cells, serials, formula results, row numbers", async () => {
    const bytes = await workbookBytes((wb) => {
      wb.addWorksheet("Notes").addRow(["not this one"]);
      const ws = wb.addWorksheet("Half-hours");
      ws.addRow(["meter", "start", "energy_kwh"]);
      ws
        .addRow(["CH-EL1", new Date("2026-10-25T01:30:00Z"), 12.5])
        .getCell(2).numFmt = "dd/mm/yyyy hh:mm";
      ws.getCell("A5").value = "NP-EL1";
      ws.getCell("B5").value = 46110 + 1 / 48;
      ws.getCell("C5").value = { formula: "1+1", result: 2 };
    });
    const streamed = await readXlsxStream(bytes, { sheet: "Half-hours" });
    expect(streamed).toEqual(await readXlsx(bytes, { sheet: "Half-hours" }));
    if ("error" in streamed) throw new Error(streamed.error);
    expect(streamed.sheet.rows.map((r) => r.number)).toEqual([1, 2, 5]);
    expect(streamed.sheet.rows[1].cells[1]).toEqual(
      new Date("2026-10-25T01:30:00Z"),
    );
    expect(await readXlsxStream(bytes, { sheet: 3 })).toEqual({
      error: 'The workbook has no worksheet "3"; it has Notes, Half-hours.',
    });
  });

  it("answers an error for bytes that are not a workbook", async () => {
    expect(
      await readXlsxStream(new TextEncoder().encode("meter,start\n")),
    ).toEqual({
      error: "The file could not be read as an Excel workbook (.xlsx).",
    });
  });
});
