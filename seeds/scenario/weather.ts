// Synthetic daily mean outdoor temperature for the Larchmere estate: a
// seasonal sine around 10.5 °C, ±7 K, coldest in mid-January, plus
// day-to-day weather as a first-order autoregressive process (a cold spell
// lasts several days, as real ones do). Invented data, deterministic.
//
// Dates are the estate's local calendar days (Europe/London), the days
// degree days are counted on.

import { gaussian, streamFor } from "./prng";

export interface DailyWeather {
  date: string;
  meanTempC: number;
}

export const WEATHER = {
  meanC: 10.5,
  amplitudeK: 7,
  /** Day of the year (1 = 1 January) with the lowest seasonal mean. */
  coldestDayOfYear: 15,
  /** AR(1) persistence from one day to the next. */
  persistence: 0.75,
  /** Standard deviation of the daily AR(1) innovation, K. */
  innovationK: 1.6,
  /** The AR(1) process starts here so any range gives the same values. */
  epoch: "2024-01-01",
} as const;

const DAY_MS = 86_400_000;

function dayNumber(date: string): number {
  return Date.parse(`${date}T00:00:00Z`) / DAY_MS;
}

function dateOf(dayNo: number): string {
  return new Date(dayNo * DAY_MS).toISOString().slice(0, 10);
}

function dayOfYear(date: string): number {
  const jan1 = dayNumber(`${date.slice(0, 4)}-01-01`);
  return dayNumber(date) - jan1 + 1;
}

export function seasonalMeanC(date: string): number {
  const phase =
    (2 * Math.PI * (dayOfYear(date) - WEATHER.coldestDayOfYear)) / 365.25;
  return WEATHER.meanC - WEATHER.amplitudeK * Math.cos(phase);
}

// The anomaly series from the epoch, extended on demand and kept: a
// module-level cache is safe because the values never change.
const anomalies: number[] = [];
const rand = streamFor("weather");

function anomalyAt(index: number): number {
  while (anomalies.length <= index) {
    const previous = anomalies.length === 0 ? 0 : anomalies.at(-1)!;
    const next =
      WEATHER.persistence * previous + WEATHER.innovationK * gaussian(rand);
    anomalies.push(next);
  }
  return anomalies[index];
}

/** The day's mean temperature, °C, rounded to 0.1 K as a weather feed gives it. */
export function dailyMeanTempC(date: string): number {
  const index = dayNumber(date) - dayNumber(WEATHER.epoch);
  if (!Number.isInteger(index) || index < 0) {
    throw new RangeError(`${date} is not a date on or after ${WEATHER.epoch}`);
  }
  const t = seasonalMeanC(date) + anomalyAt(index);
  return Math.round(t * 10) / 10;
}

/**
 * One entry per day whose midnight (UTC) lies in [from, to): for the
 * scenario period, 2024-12-01 to 2026-11-30. The bounds are midnights in
 * winter, when London time is UTC.
 */
export function dailyWeather(range: { from: Date; to: Date }): DailyWeather[] {
  const out: DailyWeather[] = [];
  const first = Math.ceil(range.from.getTime() / DAY_MS);
  for (let d = first; d * DAY_MS < range.to.getTime(); d++) {
    const date = dateOf(d);
    out.push({ date, meanTempC: dailyMeanTempC(date) });
  }
  return out;
}

/**
 * Hourly air temperature: the daily mean plus a diurnal swing of ±3 K,
 * warmest at 15:00 and coldest at 03:00 local time (common practice for a
 * temperate maritime climate). The swing averages to zero over the day, so
 * the day's mean is kept.
 */
export function hourlyTempC(dailyMeanC: number, localHour: number): number {
  return dailyMeanC + 3 * Math.cos((2 * Math.PI * (localHour - 15)) / 24);
}

/** Heating degree days of one day: max(base − mean, 0), K·day. */
export function heatingDegreeDays(meanTempC: number, baseC: number): number {
  return Math.max(baseC - meanTempC, 0);
}
