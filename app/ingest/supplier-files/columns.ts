/** Spreadsheet column letters: 0 → "A", 25 → "Z", 26 → "AA". */
export function columnLetter(index: number): string {
  let letters = "";
  for (let n = index + 1; n > 0; n = Math.floor((n - 1) / 26)) {
    letters = String.fromCharCode(65 + ((n - 1) % 26)) + letters;
  }
  return letters;
}

/**
 * How an error names a column: by its header when it has one (what the person
 * sees in their file), else by its letter.
 */
export function columnLabel(header: readonly string[], index: number): string {
  const name = header[index]?.trim();
  return name ? name : columnLetter(index);
}

/** A cell with nothing in it: null, undefined or text of only spaces. */
export function isBlank(cell: unknown): boolean {
  return (
    cell === null ||
    cell === undefined ||
    (typeof cell === "string" && cell.trim() === "")
  );
}
