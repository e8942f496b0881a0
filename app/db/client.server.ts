import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import { env } from "~/env.server";
import { noteDatabaseError, watchPool } from "./availability.server";
import * as schema from "./schema";

/**
 * Session settings of every application connection. PostgreSQL's JIT
 * compiler is off: it starts on a plan's estimated cost, and a query over
 * the monthly partitions of interval data easily estimates high enough,
 * then spends seconds compiling (measured: the report's data-quality query
 * took 3.3 s, 3.2 s of it JIT, where it runs in tens of milliseconds
 * without). The application's queries are short; none gains from it.
 */
export const SESSION_OPTIONS = "-c jit=off";

// One pool per process; kept on globalThis so Vite's dev reloads reuse it.
const globalForDb = globalThis as unknown as { joulebookPool?: pg.Pool };

function createPool(): pg.Pool {
  const created = new pg.Pool({
    connectionString: env().DATABASE_URL,
    options: SESSION_OPTIONS,
    max: 10,
    // A request waits at most this long for a connection while the database
    // is away, then gets 503 instead of hanging.
    connectionTimeoutMillis: 5_000,
  });
  watchPool(created);
  return created;
}

export const pool = globalForDb.joulebookPool ?? createPool();
globalForDb.joulebookPool = pool;

export const db = drizzle(pool, { schema });
export type Database = typeof db;
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type Executor = Database | Transaction;

export async function databaseReachable(): Promise<boolean> {
  try {
    await pool.query("select 1");
    return true;
  } catch (error) {
    noteDatabaseError(pool, error);
    return false;
  }
}
