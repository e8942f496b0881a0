/**
 * The parser's readings checked against the organisation's meters before
 * anything is sent: a code that names no meter, or a register meter (which
 * takes register reads, not interval kWh), is refused here, row by row, so
 * the preview shows it instead of the server refusing it mid-upload.
 *
 * A file whose intervals are finer than the meter's (a half-hourly supplier
 * file for an hourly meter) is summed into the meter's intervals, but only
 * where every part of an interval is in the file: an hour with one half-hour
 * missing would otherwise be stored as if complete, and look like a dip.
 * Such an incomplete interval is refused with the reason. Coarser intervals,
 * or ones that do not divide the meter's, are refused.
 */
import { isRegisterQuantity } from "../reading-schema";
import type { IntervalEnergyReading, ParseResult, RowError } from "./types";

/** A meter as the upload page knows it: the loader gives its resolution (60 when meters have no other). */
export interface UploadMeter {
  code: string;
  quantity: string;
  intervalMinutes: number;
}

export interface FitOptions {
  /** How errors name the meter column ("meter", or the chosen meter's code when one meter is chosen for the file). */
  meterColumn: string;
  /** How errors name the value column(s) for an interval that cannot be summed. */
  valueColumn: string;
}

const MINUTE_MS = 60_000;

/**
 * ISO text ↔ milliseconds, each converted once: a year's file for 50 meters
 * repeats the same 17,520 half-hours 50 times, and Date.parse and
 * toISOString on 876,000 values cost seconds in a browser.
 */
class InstantTexts {
  private readonly parsed = new Map<string, number>();
  private readonly texts = new Map<number, string>();

  ms(text: string): number {
    let ms = this.parsed.get(text);
    if (ms === undefined) {
      ms = Date.parse(text);
      this.parsed.set(text, ms);
    }
    return ms;
  }

  /** Keyed by whole minutes, small integers V8 hashes fast. */
  text(ms: number): string {
    const minute = ms / MINUTE_MS;
    let text = this.texts.get(minute);
    if (text === undefined) {
      text = new Date(ms).toISOString();
      this.texts.set(minute, text);
    }
    return text;
  }
}
/** The intervals table keeps six decimals of kWh; sums are rounded there so 0.1 + 0.2 stores as 0.3. */
const KWH_SCALE = 1e6;

interface PartialInterval {
  meter: string;
  start: number;
  stepMs: number;
  /** One bit per part present, so a part given twice does not count twice. */
  partsSeen: number;
  parts: number;
  kwh: number;
  row: number;
}

function meterProblem(
  meter: UploadMeter | undefined,
  code: string,
): string | null {
  if (meter === undefined)
    return `no meter with the code "${code}" in this organisation`;
  if (isRegisterQuantity(meter.quantity))
    return `meter ${code} is a register (cumulative kWh): upload its register reads, not kWh per interval`;
  return null;
}

function resolutionProblem(
  fileMinutes: number,
  meter: UploadMeter,
): string | null {
  if (fileMinutes === meter.intervalMinutes) return null;
  if (
    fileMinutes < meter.intervalMinutes &&
    meter.intervalMinutes % fileMinutes === 0
  )
    return null;
  return `the file gives ${fileMinutes}-minute intervals and meter ${meter.code} records ${meter.intervalMinutes}-minute intervals: a value cannot be split into shorter intervals`;
}

export interface FitResult {
  readings: IntervalEnergyReading[];
  readingRows: number[];
  /** The parser's refusals and these, in row order. */
  errors: RowError[];
  errorCount: number;
  notes: string[];
}

export function fitToMeters(
  parsed: ParseResult,
  meters: readonly UploadMeter[],
  options: FitOptions,
): FitResult {
  const byCode = new Map(meters.map((m) => [m.code, m]));
  const readings: IntervalEnergyReading[] = [];
  const readingRows: number[] = [];
  const ownErrors = new Map<string, RowError>();
  const refuse = (row: number, column: string, message: string) => {
    // A wide row gives 24–96 readings of one meter: one refusal per row and reason.
    const key = `${row}\u0000${message}`;
    if (!ownErrors.has(key)) ownErrors.set(key, { row, column, message });
  };
  const instants = new InstantTexts();
  // Per meter, the meter's intervals being summed, keyed by their start in minutes.
  const partials = new Map<string, Map<number, PartialInterval>>();
  const summedMeters = new Map<string, { from: number; to: number }>();

  parsed.readings.forEach((reading, i) => {
    const row = parsed.readingRows[i];
    const meter = byCode.get(reading.meter);
    const problem = meterProblem(meter, reading.meter);
    if (problem !== null || meter === undefined) {
      refuse(row, options.meterColumn, problem ?? "");
      return;
    }
    const start = instants.ms(reading.start);
    const fileMinutes = (instants.ms(reading.end) - start) / MINUTE_MS;
    const mismatch = resolutionProblem(fileMinutes, meter);
    if (mismatch !== null) {
      refuse(row, options.valueColumn, mismatch);
      return;
    }
    if (fileMinutes === meter.intervalMinutes) {
      readings.push(reading);
      readingRows.push(row);
      return;
    }
    let ofMeter = partials.get(meter.code);
    if (ofMeter === undefined) {
      ofMeter = new Map();
      partials.set(meter.code, ofMeter);
      summedMeters.set(meter.code, {
        from: fileMinutes,
        to: meter.intervalMinutes,
      });
    }
    const stepMs = meter.intervalMinutes * MINUTE_MS;
    const intervalStart = Math.floor(start / stepMs) * stepMs;
    const key = intervalStart / MINUTE_MS;
    let partial = ofMeter.get(key);
    if (partial === undefined) {
      partial = {
        meter: meter.code,
        start: intervalStart,
        stepMs,
        partsSeen: 0,
        parts: meter.intervalMinutes / fileMinutes,
        kwh: 0,
        row,
      };
      ofMeter.set(key, partial);
    }
    partial.partsSeen |=
      1 << ((start - intervalStart) / (fileMinutes * MINUTE_MS));
    partial.kwh += reading.energy_kwh;
  });

  for (const partial of [...partials.values()].flatMap((m) => [
    ...m.values(),
  ])) {
    const complete = partial.partsSeen === 2 ** partial.parts - 1;
    if (!complete) {
      refuse(
        partial.row,
        options.valueColumn,
        `meter ${partial.meter} records ${partial.stepMs / MINUTE_MS}-minute intervals; the one starting ${new Date(partial.start).toISOString().slice(0, 16).replace("T", " ")} UTC is not complete in the file, so it is not stored`,
      );
      continue;
    }
    readings.push({
      meter: partial.meter,
      quantity: "interval_energy",
      start: instants.text(partial.start),
      end: instants.text(partial.start + partial.stepMs),
      energy_kwh: Math.round(partial.kwh * KWH_SCALE) / KWH_SCALE,
    });
    readingRows.push(partial.row);
  }

  const notes = [...parsed.notes];
  for (const [code, { from, to }] of summedMeters) {
    notes.push(
      `Meter ${code} records ${to}-minute intervals: the file's ${from}-minute values are added up into them, ${to / from} to each.`,
    );
  }
  const errors = [...parsed.errors, ...ownErrors.values()].sort(
    (a, b) => a.row - b.row,
  );
  return {
    readings,
    readingRows,
    errors,
    errorCount: parsed.errorCount + ownErrors.size,
    notes,
  };
}

/**
 * The readings of rows without any refusal: what "store the good rows only"
 * sends. A row with one bad value is left out whole, so a day is never stored
 * with a hole the person did not choose.
 */
export function goodRowsOnly(fit: FitResult): {
  readings: IntervalEnergyReading[];
  readingRows: number[];
} {
  const badRows = new Set(fit.errors.map((e) => e.row));
  const readings: IntervalEnergyReading[] = [];
  const readingRows: number[] = [];
  fit.readings.forEach((reading, i) => {
    if (badRows.has(fit.readingRows[i])) return;
    readings.push(reading);
    readingRows.push(fit.readingRows[i]);
  });
  return { readings, readingRows };
}
