import type { Pool, PoolClient } from "pg";

/**
 * The one place a raw pg client opens, commits, rolls back and returns a
 * transaction. Ordinary writes use Drizzle's `db.transaction`; this is for
 * the hot paths that write with SQL of their own on a pg client (readings
 * ingest, estimates, interval edits and the rollups they move: see the
 * benches named where each is called).
 *
 * `work`'s result is returned only after COMMIT has succeeded, so a caller
 * that acknowledges after this resolves never acknowledges an uncommitted
 * write. Any error rolls back and is rethrown. Work that decides to write
 * nothing (a refused edit) may simply return: committing a transaction that
 * changed nothing releases its row locks just as a rollback would.
 */
export async function withTransaction<T>(
  pool: Pool,
  work: (client: PoolClient) => Promise<T>,
): Promise<T> {
  const client = await pool.connect();
  // Set when the connection itself is in doubt, so the pool drops it.
  let broken: Error | undefined;
  try {
    await client.query("begin");
    const result = await work(client);
    await client.query("commit");
    return result;
  } catch (error) {
    await client.query("rollback").catch((rollbackError: Error) => {
      broken = rollbackError;
    });
    throw error;
  } finally {
    client.release(broken);
  }
}
