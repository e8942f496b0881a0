/**
 * The months the Ledger page asks for: its defaults and the words for a
 * period the API would refuse. Plain module, read in the browser.
 */
import { MONTH_PATTERN, monthCount, monthKey } from "~/lib/months";

/** The ledger API answers at most ten years at a time. */
export const MAX_LEDGER_MONTHS = 120;

/** The last twelve full months before today (UTC, so server and browser agree). */
export function defaultMonths(now: Date) {
  const y = now.getUTCFullYear();
  const m = now.getUTCMonth();
  return {
    from: monthKey(new Date(Date.UTC(y, m - 12, 1))),
    to: monthKey(new Date(Date.UTC(y, m - 1, 1))),
  };
}

/** What is wrong with a from…to period, beside each field; none when it can be asked for. */
export function periodErrors(from: string, to: string) {
  const fromError = MONTH_PATTERN.test(from)
    ? undefined
    : "Use a month like 2025-01.";
  const toError = !MONTH_PATTERN.test(to)
    ? "Use a month like 2025-12."
    : fromError
      ? undefined
      : to < from
        ? "The last month comes before the first."
        : monthCount(from, to) > MAX_LEDGER_MONTHS
          ? `Choose at most ${MAX_LEDGER_MONTHS} months at a time.`
          : undefined;
  return { fromError, toError };
}
