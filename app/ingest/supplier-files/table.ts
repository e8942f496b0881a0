import type { Sheet, Table } from "./types";

/**
 * The header and the rows under it. The header is the first row with content
 * unless `headerRowNumber` names another (some supplier files open with a few
 * lines about the account); rows above it are ignored.
 */
export function toTable(sheet: Sheet, headerRowNumber?: number): Table | null {
  const headerIndex =
    headerRowNumber === undefined
      ? 0
      : sheet.rows.findIndex((row) => row.number === headerRowNumber);
  const headerRow = sheet.rows[headerIndex];
  if (headerRow === undefined) return null;
  return {
    header: headerRow.cells.map((cell) => headerText(cell)),
    headerRowNumber: headerRow.number,
    rows: sheet.rows.slice(headerIndex + 1),
    date1904: sheet.date1904,
  };
}

function headerText(cell: unknown): string {
  if (cell === null || cell === undefined) return "";
  if (cell instanceof Date) {
    // A workbook header like 00:30 can be a time cell: show it as a time.
    return cell.toISOString().slice(11, 16);
  }
  return String(cell).trim();
}
