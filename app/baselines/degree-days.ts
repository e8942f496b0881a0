// Heating and cooling degree days from daily mean outdoor temperatures, by
// the mean-temperature method: each day counts the difference between the
// base temperature and the day's mean, when it is on the side that needs
// heating (or cooling), and a period's value is the sum over its days, in
// K·day (common practice; CIBSE TM41:2006 "Degree-days: theory and
// application"; ISO 15927-6:2007 defines accumulated temperature
// differences and gives approximate methods from daily mean temperatures).
//
// Days are site-local calendar days, so a month's degree days are the sum
// over the days of the site's own month.

import { formatCelsius } from "~/lib/format";
import { MONTH_PATTERN } from "~/lib/months";

/** One site-local day's mean outdoor temperature. */
export interface DailyTemperature {
  /** YYYY-MM-DD, a calendar day in the site's time zone. */
  day: string;
  meanTempC: number;
}

/** HDD of one day: max(0, θ_b − θ_m), K·day. */
export function heatingDegreeDays(meanTempC: number, baseC: number): number {
  return Math.max(0, baseC - meanTempC);
}

/** CDD of one day: max(0, θ_m − θ_b), K·day. */
export function coolingDegreeDays(meanTempC: number, baseC: number): number {
  return Math.max(0, meanTempC - baseC);
}

/**
 * A day's mean from its extremes, (θ_max + θ_min)/2, the usual daily mean
 * when a station reports only the maximum and minimum (common practice).
 */
export function meanFromExtremes(maxC: number, minC: number): number {
  if (maxC < minC)
    throw new RangeError("the maximum temperature is below the minimum");
  return (maxC + minC) / 2;
}

export type DegreeDayDriver = "hdd" | "cdd";

export const driverLabels: Record<DegreeDayDriver, string> = {
  hdd: "Heating degree days",
  cdd: "Cooling degree days",
};

/**
 * Degree days as the trade writes them: the kind and its base temperature,
 * "HDD (15.5 °C)". The unit (K·day) belongs to the method notes. A
 * no-break space keeps the temperature with its unit when a narrow column
 * heading wraps.
 */
export function degreeDayLabel(driver: DegreeDayDriver, baseC: number): string {
  return `${driver === "hdd" ? "HDD" : "CDD"} (${formatCelsius(baseC)})`;
}

/** Days in a YYYY-MM month of the Gregorian calendar. */
export function daysInMonth(month: string): number {
  const match = MONTH_PATTERN.exec(month);
  if (!match) throw new RangeError(`${month} is not a month like 2025-01`);
  return new Date(Date.UTC(Number(match[1]), Number(match[2]), 0)).getUTCDate();
}

/** The months from `from` to `to`, both YYYY-MM and inclusive. */
export function monthsBetween(from: string, to: string): string[] {
  if (!MONTH_PATTERN.test(from) || !MONTH_PATTERN.test(to))
    throw new RangeError("months look like 2025-01");
  const out: string[] = [];
  let [y, m] = from.split("-").map(Number);
  const [ty, tm] = to.split("-").map(Number);
  while (y < ty || (y === ty && m <= tm)) {
    out.push(`${y}-${String(m).padStart(2, "0")}`);
    m += 1;
    if (m === 13) {
      y += 1;
      m = 1;
    }
  }
  return out;
}

export interface MonthlyDegreeDays {
  /** YYYY-MM, the site-local month. */
  month: string;
  hdd: number;
  cdd: number;
  /** Days of the month with a temperature. */
  days: number;
  daysInMonth: number;
  /** Every day of the month has a temperature. */
  complete: boolean;
}

/**
 * Monthly sums of daily HDD and CDD to one base temperature, one entry per
 * month from `from` to `to` (months with no temperature at all have zero
 * days). Days outside the range are ignored; a day given twice counts once,
 * the later entry winning.
 */
export function monthlyDegreeDays(
  temperatures: readonly DailyTemperature[],
  baseC: number,
  range: { from: string; to: string },
): MonthlyDegreeDays[] {
  const byDay = new Map<string, number>();
  for (const t of temperatures) byDay.set(t.day, t.meanTempC);
  const sums = new Map<string, { hdd: number; cdd: number; days: number }>();
  for (const month of monthsBetween(range.from, range.to))
    sums.set(month, { hdd: 0, cdd: 0, days: 0 });
  for (const [day, meanTempC] of byDay) {
    const sum = sums.get(day.slice(0, 7));
    if (!sum) continue;
    sum.hdd += heatingDegreeDays(meanTempC, baseC);
    sum.cdd += coolingDegreeDays(meanTempC, baseC);
    sum.days += 1;
  }
  return [...sums].map(([month, s]) => {
    const length = daysInMonth(month);
    return {
      month,
      hdd: s.hdd,
      cdd: s.cdd,
      days: s.days,
      daysInMonth: length,
      complete: s.days === length,
    };
  });
}
