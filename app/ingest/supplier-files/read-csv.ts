/**
 * A CSV file into rows of text cells with their spreadsheet row numbers.
 * papaparse guesses the delimiter (comma, semicolon, tab), honours quotes and
 * drops a byte-order mark. Cells stay text: the layouts decide what each means.
 */
import Papa from "papaparse";
import type { Sheet, SheetRow } from "./types";
import { isBlank } from "./columns";

export function readCsv(text: string): Sheet {
  const body = text.replace(/^\uFEFF/, "");
  // papaparse's delimiter guess counts empty lines as one-field rows and then
  // prefers a comma, so it guesses on the first lines without them.
  const delimiter = Papa.parse<string[]>(body.slice(0, 64_000), {
    preview: 20,
    skipEmptyLines: true,
  }).meta.delimiter;
  const parsed = Papa.parse<string[]>(body, {
    header: false,
    delimiter,
    dynamicTyping: false,
    // Empty lines are kept so that each record's index is its row number.
    skipEmptyLines: false,
  });
  const rows: SheetRow[] = [];
  parsed.data.forEach((cells, index) => {
    if (cells.some((cell) => !isBlank(cell))) {
      rows.push({ number: index + 1, cells });
    }
  });
  return { rows, date1904: false };
}
