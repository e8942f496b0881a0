/**
 * Times on pages, written so the server's HTML and the browser's first render
 * agree (React refuses to hydrate text that differs, error #418):
 *
 * - a relative time ("4 minutes ago") is measured from a `now` the loader
 *   sends, never from the clock of whichever machine renders it, whose clock
 *   may have moved on or be set differently;
 * - an absolute time is written in UTC, never in the time zone of the machine
 *   that renders it (the server's and the browser's differ).
 *
 * Times that belong to a site (readings, months) use the site's zone instead.
 */
import { formatDistanceStrict } from "date-fns";

type Instant = Date | string;

/** "4 minutes ago" (or "in 4 minutes") of `at`, seen from `now`. */
export function timeAgo(at: Instant, now: Instant): string {
  return formatDistanceStrict(new Date(at), new Date(now), { addSuffix: true });
}

const utcDay = new Intl.DateTimeFormat("en-GB", {
  day: "numeric",
  month: "short",
  year: "numeric",
  timeZone: "UTC",
});

const utcTime = new Intl.DateTimeFormat("en-GB", {
  hour: "2-digit",
  minute: "2-digit",
  hourCycle: "h23",
  timeZone: "UTC",
});

/** "5 Dec 2026", the UTC date of an instant. */
export function dayUtc(at: Instant): string {
  return utcDay.format(new Date(at));
}

const utcTimeSeconds = new Intl.DateTimeFormat("en-GB", {
  hour: "2-digit",
  minute: "2-digit",
  second: "2-digit",
  hourCycle: "h23",
  timeZone: "UTC",
});

/** "5 Dec 2026, 08:08 UTC" (with `seconds`, "08:08:41 UTC"). */
export function dateTimeUtc(
  at: Instant,
  options: { seconds?: boolean } = {},
): string {
  const date = new Date(at);
  const time = options.seconds ? utcTimeSeconds : utcTime;
  return `${utcDay.format(date)}, ${time.format(date)} UTC`;
}
