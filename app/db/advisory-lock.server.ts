/**
 * Work that must not overlap across server processes or machines, held under
 * a PostgreSQL session advisory lock for its whole length (which may include
 * calls to other services, so it cannot be one transaction). The lock lives
 * on one pooled connection; if releasing it fails, the connection is
 * discarded, which releases it too.
 */
import { pool } from "./client.server";

export async function withAdvisoryLock<T>(
  name: string,
  work: () => Promise<T>,
): Promise<T> {
  const client = await pool.connect();
  let broken = false;
  try {
    await client.query("select pg_advisory_lock(hashtextextended($1, 0))", [
      name,
    ]);
    return await work();
  } finally {
    await client
      .query("select pg_advisory_unlock(hashtextextended($1, 0))", [name])
      .catch(() => {
        broken = true;
      });
    client.release(broken);
  }
}
