/**
 * One row per interval: a time, an energy and (unless one meter is chosen for
 * the file) a meter code on each row. The time is the interval's start or,
 * as many supplier files stamp it, its end; the mapping says which.
 */
import { columnLabel } from "./columns";
import {
  DateTextCache,
  detectDateOrder,
  readDateCell,
  type DateOrder,
} from "./date-text";
import { readEnergyCell } from "./energy-value";
import { emptyResult, ErrorList } from "./error-list";
import {
  IsoText,
  clockShift,
  formatWallDate,
  formatWallTime,
  mappingErrors,
  meterOf,
  type MeterSource,
  type ParseOptions,
} from "./layout-common";
import type { IntervalMinutes, ParseResult, Table } from "./types";
import { ZoneClock, isValidTimeZone } from "./zone-clock";

export interface LongLayoutMapping {
  layout: "long";
  meter: MeterSource;
  /** The column of interval times, and whether they mark each interval's start or its end. */
  time: { column: number; marks: "start" | "end" };
  energy: { column: number };
  /** The meters' resolution: each row is one interval this long. */
  intervalMinutes: IntervalMinutes;
}

const MINUTE_MS = 60_000;

/**
 * Which of a repeated hour's two instants a row means. A file in local time
 * writes 01:00 and 01:30 twice on the day the clocks go back; read in file
 * order, the first is the earlier (summer time), the second the later.
 */
class RepeatedTimes {
  private readonly seen = new Map<string, number>();

  occurrence(meter: string, wall: number): number {
    const key = `${meter}\u0000${wall}`;
    const n = (this.seen.get(key) ?? 0) + 1;
    this.seen.set(key, n);
    return n;
  }
}

/**
 * Interval starts already read per meter, to refuse a second row for the same
 * interval. Keyed by minutes since 1970, small integers V8 hashes fast
 * (milliseconds would be boxed doubles).
 */
class SeenIntervals {
  private readonly byMeter = new Map<string, Map<number, number>>();

  /** The row that already gave this interval, or undefined (and the interval is recorded). */
  claim(meter: string, start: number, row: number): number | undefined {
    let starts = this.byMeter.get(meter);
    if (starts === undefined) {
      starts = new Map();
      this.byMeter.set(meter, starts);
    }
    const key = start / 60_000;
    const earlier = starts.get(key);
    if (earlier === undefined) starts.set(key, row);
    return earlier;
  }
}

export function parseLongLayout(
  table: Table,
  mapping: LongLayoutMapping,
  options: ParseOptions,
): ParseResult {
  const errors = new ErrorList(options.maxErrors);
  const result = emptyResult(errors);
  const problems = mappingErrors(
    table,
    { time: mapping.time.column, energy: mapping.energy.column },
    mapping.meter,
  );
  if (!isValidTimeZone(options.timeZone))
    problems.push(`"${options.timeZone}" is not a time zone.`);
  if (![15, 30, 60].includes(mapping.intervalMinutes)) {
    problems.push("The interval length must be 15, 30 or 60 minutes.");
  }
  for (const problem of problems)
    errors.add(table.headerRowNumber, "", problem);
  if (problems.length > 0) return { ...result, errorCount: errors.count };

  const { header } = table;
  const timeLabel = columnLabel(header, mapping.time.column);
  const energyLabel = columnLabel(header, mapping.energy.column);
  const order = new DateTextCache(
    chooseOrder(
      table,
      mapping.time.column,
      timeLabel,
      options.dateOrder,
      result.notes,
    ),
  );
  const clock = new ZoneClock(options.timeZone);
  const iso = new IsoText();
  const repeated = new RepeatedTimes();
  const seen = new SeenIntervals();
  const lengthMs = mapping.intervalMinutes * MINUTE_MS;
  const notes = new Set<string>();

  for (const row of table.rows) {
    const energy = readEnergyCell(row.cells[mapping.energy.column] ?? null);
    // A blank value is no reading (not zero): the row is skipped, whatever else it holds.
    if (energy === null) continue;
    const meter = meterOf(mapping.meter, row.cells, header);
    const time = readDateCell(
      row.cells[mapping.time.column] ?? null,
      order,
      table.date1904,
    );
    let failed = false;
    const refuse = (column: string, message: string) => {
      errors.add(row.number, column, message);
      failed = true;
    };
    if ("error" in meter) refuse(meter.column, meter.error);
    if ("error" in energy) refuse(energyLabel, energy.error);
    let instant = NaN;
    if (time === null) refuse(timeLabel, "no time");
    else if ("error" in time) refuse(timeLabel, time.error);
    else if (!time.hasTime)
      refuse(timeLabel, `${formatWallDate(time.wall)} has no time of day`);
    else if (time.offsetMinutes !== undefined)
      instant = time.wall - time.offsetMinutes * MINUTE_MS;
    else if (!("error" in meter)) {
      const r = clock.resolve(time.wall);
      if (r.kind === "unique") instant = r.instant;
      else if (r.kind === "skipped") {
        refuse(
          timeLabel,
          `${formatWallDate(time.wall)} ${formatWallTime(time.wall)} does not exist in ${options.timeZone}: the clocks go forward ${clockShift(r.gapMinutes)} that night`,
        );
      } else {
        const n = repeated.occurrence(meter.code, time.wall);
        if (n <= 2) {
          instant = n === 1 ? r.earlier : r.later;
          notes.add(
            `${formatWallDate(time.wall)}: the clocks go back in ${options.timeZone}, so some times happen twice; the first row at such a time is read as the earlier, the second as the later.`,
          );
        } else {
          refuse(
            timeLabel,
            `${formatWallDate(time.wall)} ${formatWallTime(time.wall)} happens twice in ${options.timeZone}, and this is its third row for meter ${meter.code}`,
          );
        }
      }
    }
    if (failed || "error" in meter || energy === null || "error" in energy)
      continue;
    const start = mapping.time.marks === "start" ? instant : instant - lengthMs;
    const earlier = seen.claim(meter.code, start, row.number);
    if (earlier !== undefined) {
      errors.add(
        row.number,
        timeLabel,
        `row ${earlier} already gives this interval of meter ${meter.code}`,
      );
      continue;
    }
    result.readings.push({
      meter: meter.code,
      quantity: "interval_energy",
      start: iso.of(start),
      end: iso.of(start + lengthMs),
      energy_kwh: energy.kwh,
    });
    result.readingRows.push(row.number);
  }
  result.notes.push(...notes);
  return { ...result, errorCount: errors.count };
}

/** The date order to read the time column in: the person's choice, else what the column's values show. */
export function chooseOrder(
  table: Table,
  column: number,
  label: string,
  chosen: DateOrder | undefined,
  notes: string[],
): DateOrder {
  if (chosen !== undefined) return chosen;
  const guess = detectDateOrder(
    (function* () {
      for (const row of table.rows) yield row.cells[column] ?? null;
    })(),
    label,
  );
  if (guess.note !== null) notes.push(guess.note);
  return guess.order;
}
