/**
 * Whether PostgreSQL can be reached, as the serving process last saw it.
 *
 * When the database stops (a restart, a fail-over), node-postgres reports it
 * as an `error` event on idle and checked-out clients; without a listener,
 * that event ends the process. Here every such error is logged and marks the
 * database as away; while it is away, requests get 503 with Retry-After
 * (app/db/unavailable.server.ts) instead of a crash or a 500, and a probe asks
 * every second until it answers again, so the process serves again by itself.
 */
import type pg from "pg";

/** SQLSTATEs and socket errors that mean "the server is not there", not "your query is wrong". */
const UNAVAILABLE_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "EPIPE",
  "ETIMEDOUT",
  "EHOSTUNREACH",
  "ENETUNREACH",
  "EAI_AGAIN",
  "57P01", // admin_shutdown
  "57P02", // crash_shutdown
  "57P03", // cannot_connect_now (starting up or shutting down)
  "08000", // connection_exception
  "08001", // unable to establish a connection
  "08003", // connection_does_not_exist
  "08006", // connection_failure
]);

const UNAVAILABLE_MESSAGES = [
  /Connection terminated/i,
  /timeout exceeded when trying to connect/i,
  /not queryable/i,
  /Client was closed and is not queryable/i,
];

/** Looks through wrapped causes (drizzle wraps driver errors) and AggregateErrors. */
export function isDatabaseUnavailable(error: unknown, depth = 0): boolean {
  if (!error || typeof error !== "object" || depth > 6) return false;
  const { code, message, cause, errors } = error as {
    code?: unknown;
    message?: unknown;
    cause?: unknown;
    errors?: unknown;
  };
  if (typeof code === "string" && UNAVAILABLE_CODES.has(code)) return true;
  if (
    typeof message === "string" &&
    UNAVAILABLE_MESSAGES.some((pattern) => pattern.test(message))
  )
    return true;
  if (
    Array.isArray(errors) &&
    errors.some((e) => isDatabaseUnavailable(e, depth + 1))
  )
    return true;
  return isDatabaseUnavailable(cause, depth + 1);
}

const PROBE_EVERY_MS = 1_000;

interface State {
  away: boolean;
  since: Date | null;
  probe: NodeJS.Timeout | null;
}

const globalForState = globalThis as unknown as { joulebookDbState?: State };
const state: State = (globalForState.joulebookDbState ??= {
  away: false,
  since: null,
  probe: null,
});

export function databaseAway(): boolean {
  return state.away;
}

/** Called with any error a query or connection raised; only outages count. */
export function noteDatabaseError(pool: pg.Pool, error: unknown): void {
  if (!isDatabaseUnavailable(error) || state.away) return;
  state.away = true;
  state.since = new Date();
  console.error(
    `[db] PostgreSQL is unreachable (${(error as Error).message}); answering 503 until it is back`,
  );
  state.probe = setInterval(() => void probe(pool), PROBE_EVERY_MS);
  state.probe.unref();
}

async function probe(pool: pg.Pool): Promise<void> {
  try {
    await pool.query("select 1");
  } catch {
    return;
  }
  if (state.probe) clearInterval(state.probe);
  const seconds = state.since
    ? Math.round((Date.now() - state.since.getTime()) / 1000)
    : 0;
  Object.assign(state, { away: false, since: null, probe: null });
  console.log(`[db] PostgreSQL is reachable again after ${seconds} s`);
}

/**
 * Listens for the errors node-postgres emits outside a query: on the pool for
 * idle clients, and on every client for the time it is checked out.
 */
export function watchPool(pool: pg.Pool): void {
  pool.on("error", (error) => noteDatabaseError(pool, error));
  pool.on("connect", (client) => {
    client.on("error", (error) => noteDatabaseError(pool, error));
  });
}
