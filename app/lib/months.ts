/**
 * Calendar months as `YYYY-MM`, shared by pages, API, reports and jobs; the
 * match's groups are the year and the month.
 */
export const MONTH_PATTERN = /^(\d{4})-(0[1-9]|1[0-2])$/;

/** The UTC month of an instant. */
export function monthKey(date: Date): string {
  return date.toISOString().slice(0, 7);
}

/** How many months `from`…`to` spans, both included (≤ 0 when to precedes from). */
export function monthCount(from: string, to: string): number {
  const [fy, fm] = from.split("-").map(Number);
  const [ty, tm] = to.split("-").map(Number);
  return (ty - fy) * 12 + (tm - fm) + 1;
}

/** The instants a `YYYY-MM` month runs between (UTC), or null for anything else. */
export function monthRange(month: string): { from: string; to: string } | null {
  if (!/^\d{4}-\d{2}$/.test(month)) return null;
  const [y, m] = month.split("-").map(Number);
  return {
    from: new Date(Date.UTC(y, m - 1, 1)).toISOString(),
    to: new Date(Date.UTC(y, m, 1)).toISOString(),
  };
}
