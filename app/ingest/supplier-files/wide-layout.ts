/**
 * One row per day: a date, then the day's intervals in local clock order
 * (48 half-hours, 24 hours or 96 quarter-hours), and a meter code unless one
 * meter is chosen for the file.
 *
 * Days the clocks change (Europe/London: last Sundays of March and October)
 * have fewer or more intervals than columns. Suppliers write them in one of
 * two ways, both read here:
 * - the clock's columns kept, with the hour that does not exist left blank
 *   (spring) — or, in autumn, 50 columns (a 48-column file's autumn row may
 *   run 2 cells past the header when the interval columns end the row);
 * - the day's actual intervals in order: 46 values then blanks in spring,
 *   50 values in autumn, the repeated hour twice.
 * A row that fits neither is refused with the day's count of intervals.
 */
import { columnLabel, isBlank } from "./columns";
import { readDateCell } from "./date-text";
import { readEnergyCell } from "./energy-value";
import { emptyResult, ErrorList } from "./error-list";
import {
  IsoText,
  clockShift,
  formatWallDate,
  formatWallTime,
  intervalWord,
  mappingErrors,
  meterOf,
  type MeterSource,
  type ParseOptions,
} from "./layout-common";
import { chooseOrder } from "./long-layout";
import type { Cell, IntervalMinutes, ParseResult, Table } from "./types";
import { ZoneClock, isValidTimeZone, type LocalDay } from "./zone-clock";

export interface WideLayoutMapping {
  layout: "wide";
  meter: MeterSource;
  date: { column: number };
  /** The interval columns: where they begin and how many the header has (24, 25, 48, 50, 96 or 100). */
  intervals: { firstColumn: number; count: number };
}

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;

/** Interval columns in a header → the resolution they imply; 25, 50 and 100 leave room for the autumn day. */
const RESOLUTION_OF_COUNT: Record<number, IntervalMinutes> = {
  24: 60,
  25: 60,
  48: 30,
  50: 30,
  96: 15,
  100: 15,
};

export function resolutionOfColumnCount(
  count: number,
): IntervalMinutes | undefined {
  return RESOLUTION_OF_COUNT[count];
}

/** How a local day's intervals sit against the columns of the clock. */
interface DayShape {
  day: LocalDay;
  /** Intervals the day has: 48 on most days, 46 and 50 on the clock-change days (half-hourly). */
  count: number;
  /** Start of each of the day's intervals, in order. */
  starts: number[];
  /** On a short day, clock column → its interval start, NaN for a time that does not exist. */
  byClockColumn: number[];
  /** The clock-change hour as "01:00–02:00" local, for explanations. */
  changeWall: string;
}

function shapeOf(
  clock: ZoneClock,
  wallMidnight: number,
  minutes: number,
): DayShape | { error: string } {
  const d = new Date(wallMidnight);
  const day = clock.day(
    d.getUTCFullYear(),
    d.getUTCMonth() + 1,
    d.getUTCDate(),
  );
  const lengthMs = minutes * MINUTE_MS;
  const count = (day.end - day.start) / lengthMs;
  if (!Number.isInteger(count)) {
    return {
      error: `${formatWallDate(wallMidnight)} in ${clock.timeZone} is not a whole number of ${minutes}-minute intervals long`,
    };
  }
  const starts = Array.from(
    { length: count },
    (_, i) => day.start + i * lengthMs,
  );
  const normal = DAY_MS / lengthMs;
  const byClockColumn: number[] = [];
  let changeWall = "";
  if (!day.steady) {
    let previous = -Infinity;
    byClockColumn.length = normal;
    byClockColumn.fill(NaN);
    for (const start of starts) {
      const wallMinutes = clock.wallMinutesOfDay(start, wallMidnight);
      if (wallMinutes - previous !== minutes && previous !== -Infinity) {
        // The clock jumped between the previous interval and this one.
        const from = count < normal ? previous + minutes : wallMinutes;
        const to = from + Math.abs(count - normal) * minutes;
        changeWall = `${formatWallTime(wallMidnight + from * MINUTE_MS)}–${formatWallTime(wallMidnight + to * MINUTE_MS)}`;
      }
      if (count < normal) byClockColumn[wallMinutes / minutes] = start;
      previous = wallMinutes;
    }
  }
  return { day, count, starts, byClockColumn, changeWall };
}

export function parseWideLayout(
  table: Table,
  mapping: WideLayoutMapping,
  options: ParseOptions,
): ParseResult {
  const errors = new ErrorList(options.maxErrors);
  const result = emptyResult(errors);
  const { firstColumn, count: headerCount } = mapping.intervals;
  const minutes = resolutionOfColumnCount(headerCount);
  const problems = mappingErrors(
    table,
    {
      date: mapping.date.column,
      "first interval": firstColumn,
      "last interval": firstColumn + headerCount - 1,
    },
    mapping.meter,
  );
  if (minutes === undefined) {
    problems.push(
      `A day has 24 hourly, 48 half-hourly or 96 quarter-hourly intervals (25, 50 or 100 with room for the day the clocks go back); the mapping gives ${headerCount} interval columns.`,
    );
  }
  if (!isValidTimeZone(options.timeZone))
    problems.push(`"${options.timeZone}" is not a time zone.`);
  for (const problem of problems)
    errors.add(table.headerRowNumber, "", problem);
  if (problems.length > 0 || minutes === undefined)
    return { ...result, errorCount: errors.count };

  const { header } = table;
  const dateLabel = columnLabel(header, mapping.date.column);
  const order = chooseOrder(
    table,
    mapping.date.column,
    dateLabel,
    options.dateOrder,
    result.notes,
  );
  const clock = new ZoneClock(options.timeZone);
  const iso = new IsoText();
  // The ISO text of a placement's starts and ends, made once per day and
  // placement: the 50 meters' rows of a day share the same arrays.
  const isoTexts = new WeakMap<
    number[],
    { starts: string[]; ends: string[] }
  >();
  const isoOf = (starts: number[]) => {
    let texts = isoTexts.get(starts);
    if (texts === undefined) {
      texts = {
        starts: starts.map((t) => (Number.isNaN(t) ? "" : iso.of(t))),
        ends: starts.map((t) => (Number.isNaN(t) ? "" : iso.of(t + lengthMs))),
      };
      isoTexts.set(starts, texts);
    }
    return texts;
  };
  const shapes = new Map<number, DayShape | { error: string }>();
  const seenDays = new Map<string, number>();
  const lengthMs = minutes * MINUTE_MS;
  const normal = DAY_MS / lengthMs;
  const word = intervalWord(minutes);
  // Cells past the header belong to the interval columns only when those end the header.
  const intervalsEndRow = firstColumn + headerCount === header.length;

  for (const row of table.rows) {
    const available = intervalsEndRow
      ? Math.max(headerCount, row.cells.length - firstColumn)
      : headerCount;
    const values: Cell[] = row.cells.slice(
      firstColumn,
      firstColumn + available,
    );
    const lastFilled = findLastFilled(values);
    if (lastFilled < 0) continue; // a day with no values: nothing to read
    const refuse = (column: string, message: string) =>
      errors.add(row.number, column, message);

    const meter = meterOf(mapping.meter, row.cells, header);
    if ("error" in meter) refuse(meter.column, meter.error);
    const date = readDateCell(
      row.cells[mapping.date.column] ?? null,
      order,
      table.date1904,
    );
    if (date === null) {
      refuse(dateLabel, "no date");
      continue;
    }
    if ("error" in date) {
      refuse(dateLabel, date.error);
      continue;
    }
    if (date.wall % DAY_MS !== 0) {
      refuse(
        dateLabel,
        "expected a date without a time of day: each row is one whole day",
      );
      continue;
    }
    if ("error" in meter) continue;
    const dayKey = `${meter.code}\u0000${date.wall}`;
    const earlierRow = seenDays.get(dayKey);
    if (earlierRow !== undefined) {
      refuse(
        dateLabel,
        `row ${earlierRow} already gives ${formatWallDate(date.wall)} for meter ${meter.code}`,
      );
      continue;
    }
    seenDays.set(dayKey, row.number);

    let shape = shapes.get(date.wall);
    if (shape === undefined) {
      shape = shapeOf(clock, date.wall, minutes);
      shapes.set(date.wall, shape);
    }
    if ("error" in shape) {
      refuse(dateLabel, shape.error);
      continue;
    }
    const placed = placeColumns(shape, values, lastFilled, available, normal);
    if ("error" in placed) {
      const dayName = formatWallDate(date.wall);
      const change =
        shape.count < normal
          ? ` (the clocks go forward ${clockShift((normal - shape.count) * minutes)} at ${shape.changeWall.slice(0, 5)})`
          : shape.count > normal
            ? ` (the clocks go back ${clockShift((shape.count - normal) * minutes)}, so ${shape.changeWall} happens twice)`
            : "";
      const intro = `${dayName} has ${shape.count} ${word} in ${options.timeZone}${change}`;
      const column =
        placed.column === undefined
          ? dateLabel
          : columnLabel(header, firstColumn + placed.column);
      refuse(column, `${intro}, ${placed.error}`);
      continue;
    }
    if (placed.note)
      result.notes.push(
        `Row ${row.number} (${formatWallDate(date.wall)}): ${placed.note}`,
      );

    const texts = isoOf(placed.starts);
    for (let k = 0; k < placed.starts.length; k++) {
      if (Number.isNaN(placed.starts[k])) continue;
      const energy = readEnergyCell(values[k] ?? null);
      if (energy === null) continue;
      if ("error" in energy) {
        refuse(columnLabel(header, firstColumn + k), energy.error);
        continue;
      }
      result.readings.push({
        meter: meter.code,
        quantity: "interval_energy",
        start: texts.starts[k],
        end: texts.ends[k],
        energy_kwh: energy.kwh,
      });
      result.readingRows.push(row.number);
    }
  }
  return { ...result, errorCount: errors.count };
}

function findLastFilled(values: Cell[]): number {
  for (let k = values.length - 1; k >= 0; k--) {
    if (!isBlank(values[k])) return k;
  }
  return -1;
}

type Placement =
  /** starts[k]: the interval start of value column k (NaN: a blank column skipped). */
  | { starts: number[]; note?: string }
  /** Why the row's columns do not fit the day; `column` is the interval column (0-based) to point at. */
  | { error: string; column?: number };

/** Which interval each of a day's value columns gives, or why the row does not fit the day. */
function placeColumns(
  shape: DayShape,
  values: Cell[],
  lastFilled: number,
  available: number,
  normal: number,
): Placement {
  const { count, starts } = shape;
  if (count === normal) {
    if (lastFilled >= normal) {
      return {
        error: `but the row has values past its ${normal}th column`,
        column: lastFilled,
      };
    }
    return { starts };
  }
  if (count < normal) {
    const gaps = shape.byClockColumn.flatMap((start, k) =>
      Number.isNaN(start) ? [k] : [],
    );
    const gapsBlank = gaps.every((k) => isBlank(values[k]));
    if (gapsBlank && lastFilled < normal)
      return { starts: shape.byClockColumn };
    if (lastFilled < count) {
      return {
        starts,
        note: `the day's ${count} values read in order, the clock-change hour left out.`,
      };
    }
    if (lastFilled >= normal) {
      return {
        error: `but the row has values past its ${normal}th column`,
        column: lastFilled,
      };
    }
    return {
      error: `but the row has values in the columns for ${shape.changeWall}, times that do not exist that day: leave those ${gaps.length} columns blank, or give the day's ${count} values in order`,
      column: gaps.find((k) => !isBlank(values[k])),
    };
  }
  if (available < count) {
    return {
      error: `and the file gives ${available} columns: give that day's ${count} values in order, with the repeated hour twice`,
    };
  }
  if (lastFilled === normal - 1) {
    // A full clock's worth of values: the repeated hour is in once, and nothing says where.
    return {
      error: `and the row gives ${normal} values: give that day's ${count} values in order, with the repeated hour twice`,
    };
  }
  if (lastFilled >= count) {
    return {
      error: `but the row has values past its ${count}th column`,
      column: lastFilled,
    };
  }
  return { starts };
}
