import { dateTimeUtc, timeAgo } from "~/lib/format";

/**
 * "4 minutes ago", measured from the loader's `now` so the server and the
 * browser render the same words; the exact time (UTC) in its tooltip.
 */
export function RelativeTime({
  at,
  now,
}: {
  at: Date | string;
  now: Date | string;
}) {
  const date = new Date(at);
  return (
    <time dateTime={date.toISOString()} title={dateTimeUtc(date)}>
      {timeAgo(date, now)}
    </time>
  );
}
