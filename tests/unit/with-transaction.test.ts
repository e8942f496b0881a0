/**
 * withTransaction is the one place a raw pg client begins, commits, rolls
 * back and is returned to the pool. A scripted client records what it is
 * asked, so the order is checked exactly: work's result only after COMMIT,
 * ROLLBACK on any error, and a client whose ROLLBACK failed is handed back
 * with the error so the pool discards it instead of lending it again.
 */
import type { Pool, PoolClient } from "pg";
import { describe, expect, it } from "vitest";
import { withTransaction } from "~/db/transaction.server";

function scriptedPool(failOn: string[] = []) {
  const log: string[] = [];
  const client = {
    async query(text: string) {
      log.push(text);
      if (failOn.includes(text)) throw new Error(`${text} failed`);
      return { rows: [], rowCount: 0 };
    },
    release(error?: Error) {
      log.push(error ? `release(${error.message})` : "release");
    },
  };
  const pool = { connect: async () => client } as unknown as Pool;
  return { pool, log };
}

describe("withTransaction", () => {
  it("commits before it answers, and returns the client", async () => {
    const { pool, log } = scriptedPool();
    const result = await withTransaction(pool, async (client: PoolClient) => {
      await client.query("insert");
      return "stored";
    });
    expect(result).toBe("stored");
    expect(log).toEqual(["begin", "insert", "commit", "release"]);
  });

  it("rolls back and rethrows when the work fails", async () => {
    const { pool, log } = scriptedPool(["insert"]);
    await expect(
      withTransaction(pool, (client) => client.query("insert")),
    ).rejects.toThrow("insert failed");
    expect(log).toEqual(["begin", "insert", "rollback", "release"]);
  });

  it("does not answer when COMMIT fails", async () => {
    const { pool, log } = scriptedPool(["commit"]);
    await expect(withTransaction(pool, async () => "stored")).rejects.toThrow(
      "commit failed",
    );
    expect(log).toEqual(["begin", "commit", "rollback", "release"]);
  });

  it("discards a client whose ROLLBACK failed, keeping the first error", async () => {
    const { pool, log } = scriptedPool(["insert", "rollback"]);
    await expect(
      withTransaction(pool, (client) => client.query("insert")),
    ).rejects.toThrow("insert failed");
    expect(log).toEqual([
      "begin",
      "insert",
      "rollback",
      "release(rollback failed)",
    ]);
  });
});
