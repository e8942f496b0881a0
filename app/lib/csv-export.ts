import Papa from "papaparse";

/**
 * The one way Joulebook writes CSV for download. Cells hold text people typed
 * (site names, …), so a cell a spreadsheet would evaluate as a formula is
 * prefixed with `'` and quoted: `=HYPERLINK(…)` opens as the text it is.
 */

/** A cell: text, a JS number, or exact decimal text from PostgreSQL `numeric`. */
export type CsvValue = string | number | null | undefined;

/**
 * Cells a spreadsheet evaluates: those starting with `=`, `+`, `-`, `@`, tab
 * or carriage return. Papaparse's own pattern (`/^[=+\-@\t\r].*$/`) lets a
 * cell through when a line break follows the first character (`.` does not
 * match "\n"), so this one looks at the first character only. A plain negative
 * decimal such as "-12.5" is a number, not a formula: the ledger's exact
 * decimals arrive as text and must stay numbers.
 */
export const FORMULA_START = /^(?:[=+@\t\r]|-(?!\d+(?:\.\d+)?$))/;

/**
 * A header row and data rows as CSV text, "\n" between lines and after the
 * last. null and undefined are empty cells.
 */
export function toCsv(
  header: readonly string[],
  rows: readonly (readonly CsvValue[])[],
): string {
  // Rows as arrays, header first: papaparse's { fields, data } form writes a
  // blank line for an empty table.
  const text = Papa.unparse([[...header], ...rows.map((row) => [...row])], {
    escapeFormulae: FORMULA_START,
    newline: "\n",
  });
  return `${text}\n`;
}
