/**
 * CSV templates to download, one per layout, each with a header and two
 * example rows. The meter codes default to the demo estate's (invented)
 * electricity meters of Civic Hall and Northgate Primary School; the page can
 * pass the organisation's own. The headers are the ones `suggestMapping`
 * recognises, so a filled-in template needs no mapping step.
 */
import type { IntervalMinutes } from "./types";

export interface TemplateOptions {
  layout: "long" | "wide";
  intervalMinutes?: IntervalMinutes;
  /** Two meter codes for the example rows. */
  meterCodes?: readonly [string, string];
}

const DEMO_METERS = ["CH-EL1", "NP-EL1"] as const;
// Day 14 settles the date order: 14/04 can only be day first.
const EXAMPLE_DATE = "14/04/2026";

const pad = (n: number) => String(n).padStart(2, "0");

/** Column headings of a day's intervals in clock order: 00:00, 00:30, … 23:30 (each interval's start). */
export function intervalHeadings(minutes: IntervalMinutes): string[] {
  return Array.from({ length: 1440 / minutes }, (_, k) => {
    const m = k * minutes;
    return `${pad(Math.floor(m / 60))}:${pad(m % 60)}`;
  });
}

/** An invented working-day profile: a base load, more from 07:00 to 19:00; kWh per interval. */
function exampleKwh(
  minuteOfDay: number,
  minutes: number,
  scale: number,
): string {
  const perHour = minuteOfDay >= 420 && minuteOfDay < 1140 ? 42 : 18;
  return ((perHour * scale * minutes) / 60).toFixed(2);
}

export function csvTemplate(options: TemplateOptions): string {
  const minutes = options.intervalMinutes ?? 30;
  const [first, second] = options.meterCodes ?? DEMO_METERS;
  if (options.layout === "long") {
    return [
      "meter,start,energy_kwh",
      `${first},${EXAMPLE_DATE} 00:00,${exampleKwh(0, minutes, 1)}`,
      `${first},${EXAMPLE_DATE} ${intervalHeadings(minutes)[1]},${exampleKwh(minutes, minutes, 1)}`,
      "",
    ].join("\n");
  }
  const headings = intervalHeadings(minutes);
  const row = (meter: string, scale: number) =>
    [
      meter,
      EXAMPLE_DATE,
      ...headings.map((_, k) => exampleKwh(k * minutes, minutes, scale)),
    ].join(",");
  return [
    ["meter", "date", ...headings].join(","),
    row(first, 1),
    row(second, 0.6),
    "",
  ].join("\n");
}

export function templateFileName(options: TemplateOptions): string {
  const minutes = options.intervalMinutes ?? 30;
  return `interval-energy-${options.layout === "long" ? "one-row-per-interval" : "one-row-per-day"}-${minutes}min.csv`;
}
