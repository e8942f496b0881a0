/**
 * Moved to `~/lib/format`, the house style for dates and numbers. This alias
 * stays only until the route modules being split into components (billing,
 * members, weather baselines) import from there; then delete it.
 */
export { dateTimeUtc, dayUtc, timeAgo } from "./format";
