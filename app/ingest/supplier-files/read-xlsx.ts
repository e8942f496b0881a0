/**
 * The first (or a named) worksheet of an XLSX workbook into rows of cells.
 *
 * exceljs is loaded on first use: its browser build (package.json "browser":
 * dist/exceljs.min.js, about 1 MB) then only reaches the people who pick a
 * workbook, and the same module runs on the server under Node.
 *
 * Date cells arrive as Date objects whose UTC fields are the wall-clock time
 * shown in the cell; a date typed into a cell without a date format arrives as
 * its serial number. Both are read by `readDateCell`.
 */
import type { Cell, Sheet, SheetRow } from "./types";
import { isBlank } from "./columns";

export interface XlsxOptions {
  /** Worksheet name or 1-based position; the first worksheet when absent. */
  sheet?: string | number;
}

export type XlsxResult =
  { sheet: Sheet; sheetNames: string[] } | { error: string };

/** A cell value as exceljs gives it (formula, rich text, hyperlink, error objects included) reduced to a plain cell. */
export function plainCell(value: unknown): Cell {
  if (value === null || value === undefined) return null;
  if (
    typeof value === "string" ||
    typeof value === "number" ||
    typeof value === "boolean" ||
    value instanceof Date
  ) {
    return value;
  }
  if (typeof value === "object") {
    const v = value as Record<string, unknown>;
    if ("result" in v) return plainCell(v.result);
    if ("formula" in v || "sharedFormula" in v) return null;
    if (Array.isArray(v.richText)) {
      return v.richText
        .map((run: { text?: string }) => run.text ?? "")
        .join("");
    }
    if ("text" in v) return plainCell(v.text);
    if ("error" in v) return String(v.error);
  }
  return String(value);
}

export async function readXlsx(
  data: ArrayBuffer | Uint8Array,
  options: XlsxOptions = {},
): Promise<XlsxResult> {
  const { default: ExcelJS } = await import("exceljs");
  const workbook = new ExcelJS.Workbook();
  try {
    // exceljs's types ask for a Node Buffer; it reads any ArrayBuffer view.
    await workbook.xlsx.load(data as unknown as ArrayBuffer);
  } catch {
    return {
      error: "The file could not be read as an Excel workbook (.xlsx).",
    };
  }
  const sheetNames = workbook.worksheets.map((ws) => ws.name);
  const worksheet =
    options.sheet === undefined
      ? workbook.worksheets[0]
      : typeof options.sheet === "number"
        ? workbook.worksheets[options.sheet - 1]
        : workbook.getWorksheet(options.sheet);
  if (worksheet === undefined) {
    return {
      error:
        options.sheet === undefined
          ? "The workbook has no worksheet."
          : `The workbook has no worksheet "${options.sheet}"; it has ${sheetNames.join(", ")}.`,
    };
  }
  const rows: SheetRow[] = [];
  worksheet.eachRow({ includeEmpty: false }, (row, rowNumber) => {
    // row.values is 1-based (index 0 empty) and sparse where cells are empty.
    const values = row.values as unknown[];
    const cells: Cell[] = [];
    for (let i = 1; i < values.length; i++) cells.push(plainCell(values[i]));
    if (cells.some((cell) => !isBlank(cell)))
      rows.push({ number: rowNumber, cells });
  });
  const date1904 = Boolean(
    (workbook.properties as { date1904?: boolean } | undefined)?.date1904,
  );
  return { sheet: { rows, date1904 }, sheetNames };
}
