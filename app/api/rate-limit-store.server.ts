/**
 * An express-rate-limit store kept in PostgreSQL (`rate_limit_hits`), so
 * every server process, on this machine or behind the same load balancer,
 * counts a client's requests together. Fixed windows, like the package's
 * memory store: the first hit of a key opens a window, and a hit after it
 * ended opens the next. Each hit is one upsert, atomic per key; the window's
 * end is the database's clock, so machines with skewed clocks agree.
 *
 * Of its own rather than a package: the PostgreSQL stores published for
 * express-rate-limit bring their own pool, migration tool and an older pg;
 * this one is a table of the app's schema on the app's pool.
 */
import { eq, sql } from "drizzle-orm";
import type { ClientRateLimitInfo, Options, Store } from "express-rate-limit";
import { db } from "~/db/client.server";
import { rateLimitHits } from "~/db/schema";

export class PostgresRateLimitStore implements Store {
  /** Not local: hits counted by one process count for all of them. */
  localKeys = false;
  private windowMs = 60_000;

  /** `prefix` keeps the keys of different limiters apart in the one table. */
  constructor(readonly prefix: string) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private key(key: string): string {
    return `${this.prefix}:${key}`;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const windowEnd = sql`now() + make_interval(secs => ${this.windowMs / 1000})`;
    const expired = sql`${rateLimitHits.resetsAt} <= now()`;
    const [row] = await db
      .insert(rateLimitHits)
      .values({ key: this.key(key), hits: 1, resetsAt: windowEnd })
      .onConflictDoUpdate({
        target: rateLimitHits.key,
        set: {
          hits: sql`case when ${expired} then 1 else ${rateLimitHits.hits} + 1 end`,
          resetsAt: sql`case when ${expired} then excluded.resets_at else ${rateLimitHits.resetsAt} end`,
        },
      })
      .returning({
        hits: rateLimitHits.hits,
        resetsAt: rateLimitHits.resetsAt,
      });
    return { totalHits: row.hits, resetTime: row.resetsAt };
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const [row] = await db
      .select()
      .from(rateLimitHits)
      .where(eq(rateLimitHits.key, this.key(key)));
    if (!row || row.resetsAt.getTime() <= Date.now()) return undefined;
    return { totalHits: row.hits, resetTime: row.resetsAt };
  }

  async decrement(key: string): Promise<void> {
    await db
      .update(rateLimitHits)
      .set({ hits: sql`greatest(${rateLimitHits.hits} - 1, 0)` })
      .where(eq(rateLimitHits.key, this.key(key)));
  }

  async resetKey(key: string): Promise<void> {
    await db.delete(rateLimitHits).where(eq(rateLimitHits.key, this.key(key)));
  }
}
