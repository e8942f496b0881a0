// Time to read a year of half-hourly supplier data for 50 meters, the size
// issue #14 names (18,250 day rows × 48 values = 876,000 values), in the two
// layouts, on the pure parsing layer alone (no upload, no database):
//
//   wide   one row per meter and day, 48 half-hour columns (46 with two
//          blanks on 29 March 2026, 50 on 25 October 2026), dd/mm/yyyy dates:
//          readCsv then parseWideLayout
//   long   one row per meter and half-hour, end-stamped dd/mm/yyyy hh:mm:
//          readCsv then parseLongLayout (876,000 rows)
//
// Each is run ROUNDS times after a warm-up; the best round is reported (the
// machine is shared, and the best is the least disturbed).

import os from "node:os";
import { performance } from "node:perf_hooks";
import { parseLongLayout } from "../app/ingest/supplier-files/long-layout";
import { readCsv } from "../app/ingest/supplier-files/read-csv";
import { toTable } from "../app/ingest/supplier-files/table";
import { intervalHeadings } from "../app/ingest/supplier-files/templates";
import type { ParseResult, Table } from "../app/ingest/supplier-files/types";
import { parseWideLayout } from "../app/ingest/supplier-files/wide-layout";

const METERS = 50;
const YEAR = 2026;
const ROUNDS = 3;
const TIME_ZONE = "Europe/London";
/** Half-hours of 29 March 2026 that do not exist in London (01:00, 01:30): left blank. */
const SPRING_BLANKS = new Set([2, 3]);

const pad = (n: number) => String(n).padStart(2, "0");

function* daysOf(
  year: number,
): Generator<{ date: string; month: number; day: number }> {
  for (
    let t = Date.UTC(year, 0, 1);
    t < Date.UTC(year + 1, 0, 1);
    t += 86_400_000
  ) {
    const d = new Date(t);
    const [day, month] = [d.getUTCDate(), d.getUTCMonth() + 1];
    yield { date: `${pad(day)}/${pad(month)}/${year}`, month, day };
  }
}

/** kWh of one half-hour: a deterministic, varied two-decimal value. */
const kwh = (meter: number, day: number, k: number) =>
  (((meter * 7 + day * 13 + k * 31) % 997) / 10 + 0.25).toFixed(2);

function wideCsv(): string {
  const lines = [["meter", "date", ...intervalHeadings(30)].join(",")];
  for (let m = 0; m < METERS; m++) {
    let dayIndex = 0;
    for (const { date, month, day } of daysOf(YEAR)) {
      const count = month === 10 && day === 25 ? 50 : 48;
      const cells: string[] = [];
      for (let k = 0; k < count; k++) {
        const blank = month === 3 && day === 29 && SPRING_BLANKS.has(k);
        cells.push(blank ? "" : kwh(m, dayIndex, k));
      }
      lines.push(`BM-${pad(m)},${date},${cells.join(",")}`);
      dayIndex++;
    }
  }
  return lines.join("\n");
}

/** The same values as one end-stamped row per half-hour (the wide file's readings written out). */
function longCsv(wide: ParseResult): string {
  const lines = ["meter,end,kwh"];
  for (const r of wide.readings) {
    // Written in UTC with its offset, which the long layout takes as given.
    lines.push(`${r.meter},${r.end.slice(0, 16)}Z,${r.energy_kwh}`);
  }
  return lines.join("\n");
}

/**
 * Wall-clock and CPU milliseconds of a run. The machine is shared, so the
 * process's CPU time (user + system, garbage collection included) is shown
 * beside the wall time: it is what the parse costs when it has a core.
 */
function time<T>(run: () => T): { ms: number; cpuMs: number; value: T } {
  const start = performance.now();
  const cpu = process.cpuUsage();
  const value = run();
  const used = process.cpuUsage(cpu);
  return {
    ms: performance.now() - start,
    cpuMs: (used.user + used.system) / 1000,
    value,
  };
}

function best(
  label: string,
  csv: string,
  parse: (t: Table) => ParseResult,
): ParseResult {
  let result: ParseResult | undefined;
  const rounds: { read: number; parse: number; cpu: number }[] = [];
  time(() => parse(toTable(readCsv(csv))!)); // warm-up
  for (let i = 0; i < ROUNDS; i++) {
    result = undefined; // let the previous round's readings go before measuring
    const read = time(() => toTable(readCsv(csv))!);
    const parsed = time(() => parse(read.value));
    rounds.push({
      read: read.ms,
      parse: parsed.ms,
      cpu: read.cpuMs + parsed.cpuMs,
    });
    result = parsed.value;
  }
  const fastest = rounds.reduce((a, b) =>
    a.read + a.parse <= b.read + b.parse ? a : b,
  );
  const values = result!.readings.length;
  const ms = (n: number) => n.toFixed(0).padStart(5);
  console.log(
    `${label.padEnd(5)} ${(csv.length / 1e6).toFixed(1).padStart(5)} MB  read ${ms(fastest.read)} ms  parse ${ms(fastest.parse)} ms  total ${ms(fastest.read + fastest.parse)} ms (CPU ${ms(fastest.cpu)} ms)  ${values.toLocaleString("en-GB")} readings, ${result!.errorCount} errors`,
  );
  return result!;
}

export async function benchSupplierFiles(): Promise<void> {
  console.log(
    `node ${process.version}, ${os.cpus().length} cpus; ${METERS} meters × ${YEAR}, ${TIME_ZONE}`,
  );
  const wide = wideCsv();
  const options = { timeZone: TIME_ZONE };
  const wideResult = best("wide", wide, (t) =>
    parseWideLayout(
      t,
      {
        layout: "wide",
        meter: { column: 0 },
        date: { column: 1 },
        intervals: { firstColumn: 2, count: 48 },
      },
      options,
    ),
  );
  // 365 days × 48 half-hours, less 2 on 29 March and plus 2 on 25 October.
  const expected = METERS * 365 * 48;
  if (wideResult.readings.length !== expected || wideResult.errorCount !== 0) {
    throw new Error(`wide: expected ${expected} readings and no errors`);
  }
  best("long", longCsv(wideResult), (t) =>
    parseLongLayout(
      t,
      {
        layout: "long",
        meter: { column: 0 },
        time: { column: 1, marks: "end" },
        energy: { column: 2 },
        intervalMinutes: 30,
      },
      options,
    ),
  );
}
