/** An uploaded bill file, CSV or XLSX (chosen by its name or type), into checked bill rows. */
import { readCsv } from "~/ingest/supplier-files/read-csv";
import { readXlsx } from "~/ingest/supplier-files/read-xlsx";
import { readBillSheet, type BillFile } from "./bill-file";

export const MAX_BILL_FILE_BYTES = 2 * 1024 * 1024;

const XLSX_TYPE =
  "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

export async function readBillFile(file: File): Promise<BillFile> {
  if (file.size === 0)
    return {
      ok: false,
      problems: [{ row: 0, reason: "Choose a file of bills." }],
    };
  if (file.size > MAX_BILL_FILE_BYTES)
    return {
      ok: false,
      problems: [{ row: 0, reason: "The file is over 2 MB: split it." }],
    };
  const bytes = new Uint8Array(await file.arrayBuffer());
  if (file.name.toLowerCase().endsWith(".xlsx") || file.type === XLSX_TYPE) {
    const workbook = await readXlsx(bytes);
    if ("error" in workbook)
      return { ok: false, problems: [{ row: 0, reason: workbook.error }] };
    return readBillSheet(workbook.sheet);
  }
  return readBillSheet(readCsv(new TextDecoder().decode(bytes)));
}
