/**
 * A first guess at the column mapping from a file's header, for the mapping
 * step to start from (the person confirms or changes it). Recognises this
 * layer's templates and common headings: "meter", "date", "start"/"end"/"time",
 * "kWh"/"energy"/"consumption", and a day's interval columns headed by times
 * (00:00, 00:30 … or 00:30 … 24:00) or numbers (1 … 48).
 */
import type { SupplierFileMapping } from "./parse-supplier-file";
import type { IntervalMinutes } from "./types";
import { resolutionOfColumnCount } from "./wide-layout";

const INTERVAL_HEADING =
  /^(?:\d{1,2}[:.]\d{2}(?::\d{2})?|(?:hh|p|period|interval)?\s*\d{1,3})$/i;

function findColumn(
  header: readonly string[],
  pattern: RegExp,
  except: number[] = [],
): number {
  return header.findIndex((h, i) => pattern.test(h) && !except.includes(i));
}

/** The longest run of interval-like headings whose length is a day's count of intervals. */
function intervalRun(
  header: readonly string[],
): { firstColumn: number; count: number } | null {
  let best: { firstColumn: number; count: number } | null = null;
  let start = -1;
  for (let i = 0; i <= header.length; i++) {
    const isInterval =
      i < header.length && INTERVAL_HEADING.test(header[i].trim());
    if (isInterval && start < 0) start = i;
    if (!isInterval && start >= 0) {
      const count = i - start;
      if (
        resolutionOfColumnCount(count) !== undefined &&
        (best === null || count > best.count)
      ) {
        best = { firstColumn: start, count };
      }
      start = -1;
    }
  }
  return best;
}

export function suggestMapping(
  header: readonly string[],
  intervalMinutes: IntervalMinutes = 30,
): SupplierFileMapping | null {
  const meterColumn = findColumn(header, /meter|mpan|mprn|\bcode\b/i);
  const meter = meterColumn >= 0 ? { column: meterColumn } : { code: "" };
  const run = intervalRun(header);
  if (run !== null) {
    const date = findColumn(header, /date|day/i, [meterColumn]);
    if (date < 0) return null;
    return { layout: "wide", meter, date: { column: date }, intervals: run };
  }
  const taken = [meterColumn];
  const energy = findColumn(
    header,
    /kwh|energy|consumption|usage|value/i,
    taken,
  );
  const time = findColumn(header, /start|end|time|date|period|interval/i, [
    ...taken,
    energy,
  ]);
  if (energy < 0 || time < 0) return null;
  return {
    layout: "long",
    meter,
    time: { column: time, marks: /end/i.test(header[time]) ? "end" : "start" },
    energy: { column: energy },
    intervalMinutes,
  };
}
