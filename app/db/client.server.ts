import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import { env } from "~/env.server";
import * as schema from "./schema";

// One pool per process; kept on globalThis so Vite's dev reloads reuse it.
const globalForDb = globalThis as unknown as { joulebookPool?: pg.Pool };

export const pool =
  globalForDb.joulebookPool ??
  new pg.Pool({ connectionString: env().DATABASE_URL, max: 10 });
globalForDb.joulebookPool = pool;

export const db = drizzle(pool, { schema });
export type Database = typeof db;
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type Executor = Database | Transaction;

export async function databaseReachable(): Promise<boolean> {
  try {
    await pool.query("select 1");
    return true;
  } catch {
    return false;
  }
}
