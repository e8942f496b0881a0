/**
 * A bill file (CSV or XLSX, read by the supplier-file readers) into bill
 * rows: a header row naming the columns (any order, any case), then one bill
 * a row. Pure; every problem is reported with its row number.
 */
import type { Cell, Sheet } from "~/ingest/supplier-files/types";
import { billColumns, billRowSchema, type BillRow } from "./bill-schema";

export interface RowProblem {
  row: number;
  reason: string;
}

export type BillFile =
  | { ok: true; rows: { row: number; bill: BillRow }[] }
  | { ok: false; problems: RowProblem[] };

function cellText(cell: Cell): string {
  if (cell === null) return "";
  // An Excel date cell: its UTC fields are the day shown.
  if (cell instanceof Date) return cell.toISOString().slice(0, 10);
  return String(cell).trim();
}

export function readBillSheet(sheet: Sheet): BillFile {
  const [header, ...rows] = sheet.rows;
  if (!header)
    return { ok: false, problems: [{ row: 1, reason: "The file is empty." }] };
  const names = header.cells.map((c) => cellText(c).toLowerCase());
  const missing = billColumns.filter((c) => !names.includes(c));
  if (missing.length > 0)
    return {
      ok: false,
      problems: [
        {
          row: header.number,
          reason: `Missing column${missing.length > 1 ? "s" : ""}: ${missing.join(", ")} (the header row needs ${billColumns.join(", ")}; currency is optional)`,
        },
      ],
    };
  if (rows.length === 0)
    return {
      ok: false,
      problems: [
        {
          row: header.number,
          reason: "The file has no bills under its header.",
        },
      ],
    };
  const currencyAt = names.indexOf("currency");
  const problems: RowProblem[] = [];
  const bills: { row: number; bill: BillRow }[] = [];
  for (const row of rows) {
    const value = (column: string) =>
      cellText(row.cells[names.indexOf(column)] ?? null);
    const parsed = billRowSchema.safeParse({
      supply: value("supply"),
      period_from: value("period_from"),
      period_to: value("period_to"),
      kwh: value("kwh"),
      amount: value("amount"),
      read_type: value("read_type").toLowerCase(),
      currency:
        currencyAt >= 0 && value("currency") !== ""
          ? value("currency").toUpperCase()
          : undefined,
    });
    if (parsed.success) bills.push({ row: row.number, bill: parsed.data });
    else
      problems.push({
        row: row.number,
        reason: parsed.error.issues.map((i) => i.message).join("; "),
      });
  }
  return problems.length > 0
    ? { ok: false, problems }
    : { ok: true, rows: bills };
}
