/**
 * Counts, per request, the work a request should do only once: validating
 * the session and reading the membership. The request resolver promises
 * "once per request"; a test holds it to that (tests/integration/
 * request-resolved-once.test.ts).
 *
 * Counting is off unless the server runs with JOULEBOOK_TEST_COUNTERS=1 (the
 * test server does), and even then only requests that carry an
 * `x-joulebook-count` key are counted (app.server.ts). Otherwise `countWork`
 * finds no tally and does nothing.
 */
import { AsyncLocalStorage } from "node:async_hooks";

export interface WorkCounts {
  sessionValidations: number;
  membershipReads: number;
}

const currentTally = new AsyncLocalStorage<WorkCounts>();
const talliesByKey = new Map<string, WorkCounts>();

/** Notes one piece of work for the request being served, if it is counted. */
export function countWork(kind: keyof WorkCounts): void {
  const tally = currentTally.getStore();
  if (tally) tally[kind] += 1;
}

/** Serves a request with a fresh tally, kept under `key` for `takeCounts`. */
export function countingUnder<T>(key: string, serve: () => T): T {
  const tally: WorkCounts = { sessionValidations: 0, membershipReads: 0 };
  talliesByKey.set(key, tally);
  return currentTally.run(tally, serve);
}

/** The tally kept under `key`, forgotten once read; null for an unknown key. */
export function takeCounts(key: string): WorkCounts | null {
  const tally = talliesByKey.get(key) ?? null;
  talliesByKey.delete(key);
  return tally;
}
