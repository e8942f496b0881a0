/**
 * How long the primary waits before replacing a server process that died.
 * A process that had served a while is replaced at once; one that dies soon
 * after starting counts towards a crash loop, and each further quick death
 * doubles the wait (half a second up to a minute), so a process that cannot
 * start does not spin the machine.
 */

/** A process that lived at least this long was not part of a crash loop. */
export const STABLE_AFTER_MS = 30_000;
export const FIRST_DELAY_MS = 500;
export const MAX_DELAY_MS = 60_000;

export interface RestartState {
  /** Quick deaths in a row. */
  quickDeaths: number;
}

export function nextRestart(
  state: RestartState,
  livedMs: number,
): { state: RestartState; delayMs: number } {
  if (livedMs >= STABLE_AFTER_MS)
    return { state: { quickDeaths: 0 }, delayMs: 0 };
  const quickDeaths = state.quickDeaths + 1;
  const delayMs = Math.min(
    MAX_DELAY_MS,
    FIRST_DELAY_MS * 2 ** (quickDeaths - 1),
  );
  return { state: { quickDeaths }, delayMs };
}
