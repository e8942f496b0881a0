import { dateTimeIn, timeAgo } from "~/lib/format";

const HOUR_MS = 3_600_000;

/**
 * A meter counts as live while its newest reading ended at most this long
 * ago: hourly readings arrive once their hour has ended, so a live meter's
 * newest is under an hour old, and a second hour allows for a late gateway.
 */
export const LIVE_WITHIN_MS = 2 * HOUR_MS;

/**
 * What the newest-week view says about a meter's readings: "Live" only while
 * they keep arriving; otherwise when the last one came, in plain words and
 * in the site's time zone. `latestHourStart` is the start of the newest
 * hourly interval (the API's `latest`); the reading ended an hour later.
 */
export function newestReadingsStatus(
  latestHourStart: string | null,
  now: Date,
  timeZone: string,
): { live: boolean; text: string } {
  if (latestHourStart === null) return { live: false, text: "No readings yet" };
  const lastReading = new Date(Date.parse(latestHourStart) + HOUR_MS);
  if (now.getTime() - lastReading.getTime() <= LIVE_WITHIN_MS)
    return { live: true, text: "Live" };
  const when = dateTimeIn(lastReading, timeZone);
  const ago = timeAgo(lastReading, now);
  return { live: false, text: `Last reading ${ago} (${when})` };
}
