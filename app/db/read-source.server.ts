/**
 * Where the heavy reads go: the ledger, the readings views and the report
 * data read from a streaming standby when DATABASE_READ_URL names one, and
 * from the primary otherwise (and always without it). Callers ask for a
 * source explicitly (`withReadSource`, `withCaughtUpSource`) and hand its
 * `pool` or `db` to the query; nothing else changes where it reads.
 *
 * Read your own writes: a browser that has just changed something carries a
 * short-lived `jb_wrote` cookie (set by `markWrites` on every state-changing
 * request). While it does, a read goes to the standby only once the standby
 * has replayed everything the primary had written when the read began
 * (pg_last_wal_replay_lsn() ≥ pg_current_wal_lsn()), which includes that
 * person's write, since a write is answered only after its COMMIT; otherwise
 * the read goes to the primary. A standby that cannot be reached, or is not
 * in recovery, is left alone for a few seconds and the primary serves.
 */
import { drizzle } from "drizzle-orm/node-postgres";
import type { NextFunction, Request, Response } from "express";
import pg from "pg";
import { env } from "~/env.server";
import { isDatabaseUnavailable } from "./availability.server";
import { db, pool, SESSION_OPTIONS, type Database } from "./client.server";
import * as schema from "./schema";

export interface ReadSource {
  name: "primary" | "standby";
  pool: pg.Pool;
  db: Database;
}

export const primarySource: ReadSource = { name: "primary", pool, db };

/** The marker a person's browser carries after a write. */
export const WROTE_COOKIE = "jb_wrote";
/**
 * How long after a write a person's reads check the standby's replay first.
 * Replication on one network lags by milliseconds; a standby further behind
 * than this shows in the health check's `standby.lag_bytes`.
 */
export const READ_YOUR_WRITES_MS = 2 * 60_000;
/** After a failed check or query, the standby is left alone this long. */
const STANDBY_REST_MS = 5_000;

// One standby pool per process, kept like the primary's (client.server.ts).
const globalForRead = globalThis as unknown as {
  joulebookReadPool?: pg.Pool | null;
};

function createReadPool(): pg.Pool | null {
  const url = env().DATABASE_READ_URL;
  if (!url) return null;
  const created = new pg.Pool({
    connectionString: url,
    options: SESSION_OPTIONS,
    max: 10,
    // A standby that does not answer quickly is skipped, not waited for.
    connectionTimeoutMillis: 2_000,
  });
  // Not watchPool: a lost standby must not put the whole process into 503;
  // the primary serves its reads meanwhile.
  created.on("error", (error) => standbyFailed(error));
  created.on("connect", (client) => {
    client.on("error", (error) => standbyFailed(error));
  });
  return created;
}

const readPool =
  globalForRead.joulebookReadPool === undefined
    ? createReadPool()
    : globalForRead.joulebookReadPool;
globalForRead.joulebookReadPool = readPool;

/** The standby's drizzle instance, or null without DATABASE_READ_URL. */
export const readDb: Database | null = readPool
  ? drizzle(readPool, { schema })
  : null;

const standbySource: ReadSource | null =
  readPool && readDb ? { name: "standby", pool: readPool, db: readDb } : null;

export function standbyConfigured(): boolean {
  return standbySource !== null;
}

let standbyRestsUntil = 0;

function standbyFailed(error: unknown): void {
  if (Date.now() >= standbyRestsUntil)
    console.warn(
      `[db] the standby failed (${(error as Error).message}); reading from the primary for ${STANDBY_REST_MS / 1000} s`,
    );
  standbyRestsUntil = Date.now() + STANDBY_REST_MS;
}

function standbyResting(): boolean {
  return Date.now() < standbyRestsUntil;
}

/** The primary's current WAL position, e.g. "0/3A1B2C8". */
export async function primaryWalLsn(): Promise<string> {
  const { rows } = await pool.query<{ lsn: string }>(
    "select pg_current_wal_lsn()::text as lsn",
  );
  return rows[0].lsn;
}

/**
 * Whether the standby answers and has replayed up to `lsn`. A server that
 * is not in recovery has a null replay position, so it never counts.
 */
async function standbyReplayed(lsn: string): Promise<boolean> {
  if (!readPool || standbyResting()) return false;
  try {
    const { rows } = await readPool.query<{ ok: boolean | null }>(
      "select pg_last_wal_replay_lsn() >= $1::pg_lsn as ok",
      [lsn],
    );
    return rows[0].ok === true;
  } catch (error) {
    standbyFailed(error);
    return false;
  }
}

/**
 * The standby if it has replayed everything the primary has written so far,
 * else the primary: for reads that must see every committed write (a report
 * requested after a correction).
 */
export async function caughtUpSource(): Promise<ReadSource> {
  if (!standbySource || standbyResting()) return primarySource;
  return (await standbyReplayed(await primaryWalLsn()))
    ? standbySource
    : primarySource;
}

/** The time of the person's last write, from their cookie, if recent. */
function recentWriteAt(cookieHeader: string | undefined): number | null {
  const match = cookieHeader?.match(
    new RegExp(`(?:^|;\\s*)${WROTE_COOKIE}=(\\d{1,15})(?:;|$)`),
  );
  if (!match) return null;
  const at = Number(match[1]);
  return Date.now() - at < READ_YOUR_WRITES_MS ? at : null;
}

/**
 * The source for a person's read: the standby, unless it is away or they
 * wrote recently and it has not caught up with the primary yet.
 */
export async function readSourceFor(
  cookieHeader: string | undefined,
): Promise<ReadSource> {
  if (!standbySource || standbyResting()) return primarySource;
  if (recentWriteAt(cookieHeader) !== null) return caughtUpSource();
  // No check here: a standby that fails the read hands it to the primary
  // (readWithFallback), and one that is not a standby shows in health.
  return standbySource;
}

/**
 * Runs `read` on the source for this person; if the standby goes away
 * during the read, the same read runs on the primary instead of failing.
 */
export async function withReadSource<T>(
  cookieHeader: string | undefined,
  read: (source: ReadSource) => Promise<T>,
): Promise<T> {
  return readWithFallback(await readSourceFor(cookieHeader), read);
}

/** As withReadSource, for reads that must see every committed write. */
export async function withCaughtUpSource<T>(
  read: (source: ReadSource) => Promise<T>,
): Promise<T> {
  return readWithFallback(await caughtUpSource(), read);
}

async function readWithFallback<T>(
  source: ReadSource,
  read: (source: ReadSource) => Promise<T>,
): Promise<T> {
  if (source.name === "primary") return read(source);
  try {
    return await read(source);
  } catch (error) {
    if (!isDatabaseUnavailable(error)) throw error;
    standbyFailed(error);
    return read(primarySource);
  }
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Express middleware: a state-changing request from a browser (one that
 * sends cookies) gets the `jb_wrote` marker, so its next reads see its
 * write. Set before the request is handled, since the answer may be
 * streamed; a refused write only sends reads to the primary for a while.
 * Without a standby nothing is set.
 */
export function markWrites(
  req: Request,
  res: Response,
  next: NextFunction,
): void {
  if (standbySource && !SAFE_METHODS.has(req.method) && req.headers.cookie) {
    res.cookie(WROTE_COOKIE, String(Date.now()), {
      httpOnly: true,
      sameSite: "lax",
      secure: req.secure,
      path: "/",
      maxAge: READ_YOUR_WRITES_MS,
    });
  }
  next();
}

export interface StandbyState {
  status: "replaying" | "unreachable" | "not_a_standby";
  /** Bytes of WAL the primary has written that the standby has not replayed. */
  lag_bytes: number | null;
  /** Seconds since the standby replayed a transaction, 0 when caught up. */
  lag_seconds: number | null;
}

/** For the health check; null without DATABASE_READ_URL. */
export async function standbyState(): Promise<StandbyState | null> {
  if (!readPool) return null;
  try {
    const lsn = await primaryWalLsn();
    const { rows } = await readPool.query<{
      in_recovery: boolean;
      lag_bytes: number | null;
      lag_seconds: number | null;
    }>(
      `select pg_is_in_recovery() as in_recovery,
              greatest(pg_wal_lsn_diff($1::pg_lsn, pg_last_wal_replay_lsn()), 0)::float8 as lag_bytes,
              case when pg_last_wal_replay_lsn() >= $1::pg_lsn then 0
                   else extract(epoch from now() - pg_last_xact_replay_timestamp())::float8
              end as lag_seconds`,
      [lsn],
    );
    const row = rows[0];
    if (!row.in_recovery)
      return { status: "not_a_standby", lag_bytes: null, lag_seconds: null };
    return {
      status: "replaying",
      lag_bytes: row.lag_bytes,
      lag_seconds: row.lag_seconds,
    };
  } catch {
    return { status: "unreachable", lag_bytes: null, lag_seconds: null };
  }
}

export async function closeReadPool(): Promise<void> {
  await readPool?.end();
}
