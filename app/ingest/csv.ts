/**
 * CSV uploads use the gateway API's field names as column headers, so a file
 * is a table of readings: one row per reading, empty cells left out.
 */
export const TEXT_COLUMNS = new Set([
  "meter",
  "quantity",
  "start",
  "end",
  "time",
  "sensor_at",
  "circuit",
  "voltage_basis",
]);
export const REQUIRED_COLUMNS = ["meter", "quantity"] as const;

/** A cell that reads as a number becomes one; anything else stays text so the server can say what is wrong. */
function cellValue(column: string, cell: string): unknown {
  if (TEXT_COLUMNS.has(column)) return cell;
  const n = Number(cell);
  return cell !== "" && Number.isFinite(n) ? n : cell;
}

export function rowToReading(
  row: Record<string, string | undefined>,
): Record<string, unknown> {
  const reading: Record<string, unknown> = {};
  for (const [column, raw] of Object.entries(row)) {
    const key = column.trim();
    const cell = (raw ?? "").trim();
    if (!key || cell === "") continue;
    reading[key] = cellValue(key, cell);
  }
  return reading;
}

export function missingColumns(headers: readonly string[]): string[] {
  const present = new Set(headers.map((h) => h.trim()));
  return REQUIRED_COLUMNS.filter((c) => !present.has(c));
}

/** The spreadsheet row of a reading: the header is row 1. */
export function csvRowNumber(index: number): number {
  return index + 2;
}
