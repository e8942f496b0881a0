import { randomUUID } from "node:crypto";
import { inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { createOrganization, db, pool, schema } from "../support/db";

type Prune =
  typeof import("../../app/auth/housekeeping.server").pruneAuthRecords;
let pruneAuthRecords: Prune;
let appPool: { end(): Promise<void> };

beforeAll(async () => {
  applyAppTestEnv();
  ({ pruneAuthRecords } = await import("../../app/auth/housekeeping.server"));
  ({ pool: appPool } = await import("../../app/db/client.server"));
});
afterAll(async () => {
  await appPool.end();
  await pool.end();
});

const DAY = 86_400_000;
const ago = (days: number) => new Date(Date.now() - days * DAY);

describe("pruning sign-in records", () => {
  it("deletes expired sessions, attempts past their windows and spent links; keeps what still counts", async () => {
    const org = await createOrganization(["auditor"]);
    const userId = org.members[0].id;
    const session = (id: string, expiresAt: Date) => ({
      id,
      userId,
      expiresAt,
    });
    const [expired, live] = [randomUUID(), randomUUID()];
    await db
      .insert(schema.sessions)
      .values([session(expired, ago(1)), session(live, ago(-1))]);

    const attempt = (
      note: string,
      attemptedAt: Date,
      succeeded: boolean,
      deviceHash: string | null = null,
    ) => ({
      email: `${note}-${randomUUID()}@test.example`,
      clientAddress: "198.51.100.9",
      attemptedAt,
      succeeded,
      deviceHash,
    });
    const rows = await db
      .insert(schema.signInAttempts)
      .values([
        attempt("old-failure", ago(3), false),
        attempt("recent-failure", ago(0.01), false),
        attempt("trusting-success", ago(30), true, "d".repeat(64)),
        attempt("expired-trust", ago(200), true, "e".repeat(64)),
      ])
      .returning({
        id: schema.signInAttempts.id,
        email: schema.signInAttempts.email,
      });

    const link = (hash: string, expiresAt: Date) => ({
      tokenHash: hash,
      userId,
      expiresAt,
    });
    const [spent, fresh] = [randomUUID(), randomUUID()];
    await db
      .insert(schema.passwordResetTokens)
      .values([link(spent, ago(2)), link(fresh, ago(-0.01))]);

    const pruned = await pruneAuthRecords();
    expect(pruned.sessions).toBeGreaterThanOrEqual(1);

    const sessionsLeft = await db
      .select({ id: schema.sessions.id })
      .from(schema.sessions)
      .where(inArray(schema.sessions.id, [expired, live]));
    expect(sessionsLeft.map((s) => s.id)).toEqual([live]);

    const attemptsLeft = await db
      .select({ email: schema.signInAttempts.email })
      .from(schema.signInAttempts)
      .where(
        inArray(
          schema.signInAttempts.id,
          rows.map((r) => r.id),
        ),
      );
    expect(
      attemptsLeft.map((a) => a.email.split("-").slice(0, 2).join("-")).sort(),
    ).toEqual(["recent-failure", "trusting-success"]);

    const linksLeft = await db
      .select({ hash: schema.passwordResetTokens.tokenHash })
      .from(schema.passwordResetTokens)
      .where(inArray(schema.passwordResetTokens.tokenHash, [spent, fresh]));
    expect(linksLeft.map((l) => l.hash)).toEqual([fresh]);
  });
});
