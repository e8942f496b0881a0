// The scenario's hours with everything the load models ask about them: local
// time (occupancy follows the clock on the wall, daylight saving included),
// the day's weather, holidays. Computed for each hour as a run reaches it.

import { HOUR_MS } from "../../app/ingest/hours";
import { localParts } from "../../app/ingest/local-time";
import { isPublicHoliday, isSchoolHoliday } from "./calendar";
import { dailyMeanTempC, hourlyTempC } from "./weather";

export { HOUR_MS };
export const TIME_ZONE = "Europe/London";

export interface HourContext {
  /** Start of the UTC hour, ms since 1970. */
  t: number;
  /** The same instant as ISO 8601 without milliseconds, as gateways send. */
  iso: string;
  localDate: string;
  localHour: number;
  /** ISO weekday, 1 = Monday … 7 = Sunday. */
  weekday: number;
  /** Day of the year of the UTC date, 1–366 (for the sun's position). */
  dayOfYear: number;
  /** UTC hour plus a half: the middle of the hour, for the sun's position. */
  utcMidHour: number;
  dailyMeanC: number;
  /** Air temperature in the hour, °C. */
  tempC: number;
  publicHoliday: boolean;
  /** Weekend or bank holiday: offices and the depot are shut. */
  closedDay: boolean;
  schoolHoliday: boolean;
  /** Years since the start of the scenario (slow trends such as IT growth). */
  years: number;
}

export function isoSeconds(t: number): string {
  return new Date(t).toISOString().replace(".000Z", "Z");
}

function pad(n: number): string {
  return n < 10 ? `0${n}` : String(n);
}

function dayOfYearUtc(t: number): number {
  const d = new Date(t);
  return (t - Date.UTC(d.getUTCFullYear(), 0, 1)) / 86_400_000 + 1;
}

/** The context of the UTC hour starting at t, `epoch` being the scenario's start. */
export function hourContext(t: number, epoch: number): HourContext {
  const p = localParts(new Date(t), TIME_ZONE);
  const localDate = `${p.year}-${pad(p.month)}-${pad(p.day)}`;
  const dailyMeanC = dailyMeanTempC(localDate);
  const publicHoliday = isPublicHoliday(localDate);
  return {
    t,
    iso: isoSeconds(t),
    localDate,
    localHour: p.hour,
    weekday: p.weekday,
    dayOfYear: Math.floor(dayOfYearUtc(t)),
    utcMidHour: new Date(t).getUTCHours() + 0.5,
    dailyMeanC,
    tempC: hourlyTempC(dailyMeanC, p.hour),
    publicHoliday,
    closedDay: p.weekday >= 6 || publicHoliday,
    schoolHoliday: isSchoolHoliday(localDate),
    years: (t - epoch) / (365.25 * 24 * HOUR_MS),
  };
}
