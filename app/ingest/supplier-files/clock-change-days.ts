/**
 * The days a file covers on which the site's clocks change, said in plain
 * words beside the preview: a half-hourly day then has 46 or 50 half-hours,
 * not 48, and a person comparing the count with their file needs to know why.
 */
import { clockShift, formatWallDate, intervalWord } from "./layout-common";
import { ZoneClock } from "./zone-clock";

const DAY_MS = 86_400_000;
const MINUTE_MS = 60_000;
/** A file spanning more than this is not scanned day by day (it would still be read). */
const MAX_DAYS = 20 * 366;

export function clockChangeNotes(
  firstInstant: number,
  lastInstant: number,
  timeZone: string,
  intervalMinutes: number,
): string[] {
  if (!(lastInstant >= firstInstant)) return [];
  const clock = new ZoneClock(timeZone);
  // Wall-clock dates: a day's offset is at most ±14 hours, so a day either side covers it.
  const firstDay = Math.floor(firstInstant / DAY_MS) - 1;
  const lastDay = Math.min(
    Math.floor(lastInstant / DAY_MS) + 1,
    firstDay + MAX_DAYS,
  );
  const word = intervalWord(intervalMinutes);
  const normal = 1440 / intervalMinutes;
  const notes: string[] = [];
  for (let d = firstDay; d <= lastDay; d++) {
    const wallMidnight = d * DAY_MS;
    const day = clock.dayOfWall(wallMidnight);
    if (day.steady) continue;
    if (day.end <= firstInstant || day.start > lastInstant) continue;
    const minutes = (day.end - day.start) / MINUTE_MS;
    const count = minutes / intervalMinutes;
    const shift = clockShift(minutes - 1440);
    notes.push(
      minutes < 1440
        ? `${formatWallDate(wallMidnight)}: the clocks go forward ${shift} in ${timeZone}, so the day has ${count} ${word}, not ${normal}. A one-row-per-day file leaves the missing times blank or gives the ${count} values in order.`
        : `${formatWallDate(wallMidnight)}: the clocks go back ${shift} in ${timeZone}, so the day has ${count} ${word}, not ${normal}; the repeated times come twice, in order.`,
    );
  }
  return notes;
}
