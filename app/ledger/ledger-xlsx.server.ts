/**
 * The ledger export as an XLSX workbook: the figures as number cells with
 * the unit's number format, months as dates, total rows in bold, and a
 * Notes sheet that says what the figures are.
 */
import ExcelJS from "exceljs";
import { LEDGER_UNITS, unitLabel, type LedgerUnit } from "./ledger-units";
import type {
  ColumnKind,
  ExportCell,
  ExportOptions,
  LedgerExport,
} from "./ledger-export";

/** "#,##0.000" for three places; "#,##0" for none. */
function fixed(places: number): string {
  return places > 0 ? `#,##0.${"0".repeat(places)}` : "#,##0";
}

function numberFormats(
  unit: LedgerUnit,
  perM2: boolean,
): Record<ColumnKind, string> {
  const { decimals } = LEDGER_UNITS[unit];
  const energy = fixed(perM2 ? decimals.perM2 : decimals.total);
  return {
    // Text format, so a spreadsheet keeps a name such as "=HYPERLINK(…)"
    // as text even when someone edits the cell.
    text: "@",
    month: "mmm yyyy",
    energy,
    band: `"±"${energy}`,
    percent: "0.0",
    count: "0",
    area: "#,##0.0",
    carbon: "#,##0.000",
    money: "#,##0.00",
  };
}

/** The first of the month at 00:00 UTC: a date cell that reads "May 2026". */
function monthDate(month: string): Date {
  const [y, m] = month.split("-").map(Number);
  return new Date(Date.UTC(y, m - 1, 1));
}

/**
 * A JS string becomes a string cell, never a formula: exceljs writes a
 * formula only for `{ formula }` objects, which no column produces. Exact
 * decimal text becomes a number here, the only place it is rounded to
 * binary, because a spreadsheet cell is a binary number.
 */
function cellValue(kind: ColumnKind, value: ExportCell) {
  if (value === null) return null;
  if (kind === "text") return String(value);
  if (kind === "month") return monthDate(String(value));
  return Number(value);
}

function widthOf(kind: ColumnKind, header: string): number {
  if (kind === "text" && header === "Site") return 32;
  return Math.max(12, header.length + 2);
}

export interface XlsxContext extends ExportOptions {
  from: string;
  to: string;
  /** What the ledger was narrowed to, in words ("All sites"). */
  sites: string;
  carriers: string;
}

function notesSheet(book: ExcelJS.Workbook, context: XlsxContext): void {
  const notes = book.addWorksheet("Notes");
  notes.getColumn(1).width = 18;
  notes.getColumn(2).width = 110;
  const unit = LEDGER_UNITS[context.unit];
  const rows: [string, string][] = [
    ["Period", `${context.from} to ${context.to}`],
    ["Sites", context.sites],
    ["Carriers", context.carriers],
    [
      "Unit",
      `${unitLabel(context.unit, context.perM2)}: ${unit.source}${
        context.perM2 ? "; each site's figures divided by its floor area" : ""
      }`,
    ],
    [
      "Figures",
      "Delivered energy is positive and exported energy negative, for each carrier; chilled water is cooling delivered. Carriers are never added together: one total row per carrier.",
    ],
    [
      "± uncertainty",
      "The heat meters' maximum permissible error (EN 1434), where it applies; a total adds the bands.",
    ],
    [
      "Adjustments",
      "Corrections entered after the month was closed, with their count.",
    ],
  ];
  for (const [label, text] of rows) {
    const row = notes.addRow([label, text]);
    row.getCell(1).font = { bold: true };
    row.getCell(2).alignment = { wrapText: true, vertical: "top" };
  }
}

export async function ledgerXlsx(
  table: LedgerExport,
  context: XlsxContext,
): Promise<Buffer> {
  const book = new ExcelJS.Workbook();
  book.creator = "Joulebook";
  const sheet = book.addWorksheet("Ledger", {
    views: [{ state: "frozen", ySplit: 1 }],
  });
  const formats = numberFormats(context.unit, context.perM2);
  sheet.columns = table.columns.map((c, i) => ({
    header: c.header,
    key: String(i),
    width: widthOf(c.kind, c.header),
    style: { numFmt: formats[c.kind] },
  }));
  sheet.getRow(1).font = { bold: true };
  for (const line of table.lines) {
    const row = sheet.addRow(
      line.cells.map((value, i) => cellValue(table.columns[i].kind, value)),
    );
    if (line.total) {
      row.font = { bold: true };
      row.eachCell({ includeEmpty: true }, (cell) => {
        cell.border = { top: { style: "thin" } };
      });
    }
  }
  notesSheet(book, context);
  return Buffer.from(await book.xlsx.writeBuffer());
}
