/**
 * A supplier's file in the one-row-per-day layout, as the upload page reads
 * it: `meter,date,00:00,…` with dd/mm/yyyy dates, one column per interval of
 * the meter's resolution, and each day's actual intervals in order (23 or 25
 * values on Europe/London's clock-change days when hourly, 46 or 50 when
 * half-hourly). Shared by the browser test and the upload bench.
 */
import { intervalHeadings } from "../../app/ingest/supplier-files/templates";
import type { IntervalMinutes } from "../../app/ingest/supplier-files/types";
import { ZoneClock } from "../../app/ingest/supplier-files/zone-clock";

export interface WideFileOptions {
  meterCodes: readonly string[];
  /** First day, as "yyyy-mm-dd". */
  firstDay: string;
  days: number;
  minutes: IntervalMinutes;
  timeZone?: string;
}

export interface WideFile {
  csv: string;
  /** Values in the file, all meters. */
  values: number;
  /** Sum of every value, in hundredths of a kWh (each value has two decimals). */
  totalCentiKwh: number;
}

const pad = (n: number) => String(n).padStart(2, "0");

/** A deterministic, varied kWh with two decimals, never zero. */
export const centiKwhOf = (meter: number, day: number, k: number) =>
  ((meter * 7 + day * 13 + k * 31) % 997) + 25;

export function wideSupplierFile(options: WideFileOptions): WideFile {
  const clock = new ZoneClock(options.timeZone ?? "Europe/London");
  const first = Date.parse(`${options.firstDay}T00:00:00Z`);
  const lines = [
    ["meter", "date", ...intervalHeadings(options.minutes)].join(","),
  ];
  let values = 0;
  let totalCentiKwh = 0;
  options.meterCodes.forEach((code, m) => {
    for (let d = 0; d < options.days; d++) {
      const date = new Date(first + d * 86_400_000);
      const [y, mo, day] = [
        date.getUTCFullYear(),
        date.getUTCMonth() + 1,
        date.getUTCDate(),
      ];
      const local = clock.day(y, mo, day);
      const count = (local.end - local.start) / (options.minutes * 60_000);
      const cells: string[] = [];
      for (let k = 0; k < count; k++) {
        const centi = centiKwhOf(m, d, k);
        totalCentiKwh += centi;
        cells.push((centi / 100).toFixed(2));
      }
      values += count;
      lines.push([code, `${pad(day)}/${pad(mo)}/${y}`, ...cells].join(","));
    }
  });
  return { csv: `${lines.join("\n")}\n`, values, totalCentiKwh };
}
