/**
 * A chosen file read in the browser: a CSV whose header has the API's field
 * names (meter, quantity, …) goes as readings as they stand; any other CSV,
 * and every XLSX workbook, is a supplier file for the mapping step.
 */
import { missingColumns, rowToReading } from "~/ingest/csv";
import { readCsv } from "~/ingest/supplier-files/read-csv";
import { readXlsx } from "~/ingest/supplier-files/read-xlsx";
import { toTable } from "~/ingest/supplier-files/table";
import type { Table } from "~/ingest/supplier-files/types";

export type LoadedFile =
  | {
      kind: "api-fields";
      fileName: string;
      header: string[];
      readings: Record<string, unknown>[];
      readingRows: number[];
    }
  | { kind: "supplier"; fileName: string; table: Table }
  | { kind: "error"; message: string };

function isWorkbook(file: File): boolean {
  return /\.xlsx$/i.test(file.name);
}

function apiFieldReadings(fileName: string, table: Table): LoadedFile {
  const { header } = table;
  const readings = table.rows.map((row) =>
    rowToReading(
      Object.fromEntries(header.map((h, i) => [h, String(row.cells[i] ?? "")])),
    ),
  );
  return {
    kind: "api-fields",
    fileName,
    header,
    readings,
    readingRows: table.rows.map((row) => row.number),
  };
}

export async function loadFile(file: File): Promise<LoadedFile> {
  try {
    return await readTableOf(file);
  } catch {
    // A file removed or unreadable after it was chosen: said, never a crash.
    return { kind: "error", message: `${file.name} could not be read.` };
  }
}

async function readTableOf(file: File): Promise<LoadedFile> {
  let table: Table | null;
  if (isWorkbook(file)) {
    const read = await readXlsx(await file.arrayBuffer());
    if ("error" in read) return { kind: "error", message: read.error };
    table = toTable(read.sheet);
  } else {
    table = toTable(readCsv(await file.text()));
  }
  if (table === null)
    return { kind: "error", message: `${file.name} has no rows.` };
  if (table.rows.length === 0)
    return {
      kind: "error",
      message: `${file.name} has a header but no rows under it.`,
    };
  if (!isWorkbook(file) && missingColumns(table.header).length === 0)
    return apiFieldReadings(file.name, table);
  return { kind: "supplier", fileName: file.name, table };
}
