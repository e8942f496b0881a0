/**
 * The mapping step's starting point and its layout switch: suggestMapping's
 * guess when the header is recognised, else plain defaults the person
 * corrects. Pure, for the page and its tests.
 */
import type { SupplierFileMapping } from "~/ingest/supplier-files/parse-supplier-file";
import type { MeterSource } from "~/ingest/supplier-files/layout-common";
import { suggestMapping } from "~/ingest/supplier-files/suggest-mapping";
import type { IntervalMinutes } from "~/ingest/supplier-files/types";

export type Layout = SupplierFileMapping["layout"];

const asMinutes = (m: number): IntervalMinutes =>
  m === 15 || m === 30 ? m : 60;

const find = (header: readonly string[], pattern: RegExp, except: number[]) =>
  header.findIndex((h, i) => pattern.test(h) && !except.includes(i));

/** The first column not yet taken, so two roles never start on the same column. */
const firstFree = (header: readonly string[], taken: number[]) =>
  Math.max(
    0,
    header.findIndex((_, i) => !taken.includes(i)),
  );

export function mappingFor(
  layout: Layout,
  header: readonly string[],
  meter: MeterSource,
  meterMinutes: number,
): SupplierFileMapping {
  const suggested = suggestMapping(header, asMinutes(meterMinutes));
  if (suggested?.layout === layout) return { ...suggested, meter };
  const taken = "column" in meter ? [meter.column] : [];
  if (layout === "wide") {
    let date = find(header, /date|day/i, taken);
    if (date < 0) date = firstFree(header, taken);
    const firstColumn = Math.min(date + 1, header.length - 1);
    const room = header.length - firstColumn;
    const count = [100, 96, 50, 48, 25, 24].find((c) => c <= room) ?? 24;
    return {
      layout,
      meter,
      date: { column: date },
      intervals: { firstColumn, count },
    };
  }
  let time = find(header, /start|end|time|date/i, taken);
  if (time < 0) time = firstFree(header, taken);
  let energy = find(header, /kwh|energy|consumption|usage|value/i, [
    ...taken,
    time,
  ]);
  if (energy < 0) energy = firstFree(header, [...taken, time]);
  return {
    layout,
    meter,
    time: {
      column: time,
      marks: /end/i.test(header[time] ?? "") ? "end" : "start",
    },
    energy: { column: energy },
    intervalMinutes: asMinutes(meterMinutes),
  };
}

/** The first guess: the suggested layout and meter column, else one row per interval for the first meter. */
export function initialMapping(
  header: readonly string[],
  fallbackMeterCode: string,
  meterMinutes: number,
): SupplierFileMapping {
  const suggested = suggestMapping(header, asMinutes(meterMinutes));
  if (suggested !== null)
    return "code" in suggested.meter
      ? { ...suggested, meter: { code: fallbackMeterCode } }
      : suggested;
  return mappingFor("long", header, { code: fallbackMeterCode }, meterMinutes);
}
