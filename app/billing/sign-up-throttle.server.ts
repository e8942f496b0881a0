/**
 * Sign-ups per client address: each one makes an organisation, a user with a
 * password hash and a Stripe customer, so a client may make only a few an
 * hour. Kept in the database beside the sign-in attempts (same table, same
 * window arithmetic as app/auth/throttle.server.ts), so the limit holds
 * across server processes and restarts. A sign-up's row is told apart by its
 * `email` column: `sign-up:<address tried>`, which no sign-in can match (a
 * sign-in's address never contains a colon before the @).
 *
 * A failed sign-up (the address is taken) stays recorded as a failure, so it
 * also counts towards the client's failed sign-ins: both answer whether an
 * account exists.
 */
import { and, count, eq, gt, like, min } from "drizzle-orm";
import { db } from "~/db/client.server";
import { signInAttempts } from "~/db/schema";

export const SIGN_UP_WINDOW_MINUTES = 60;
export const MAX_SIGN_UPS_PER_CLIENT = 5;

const MARK = "sign-up:";

export type SignUpClaim =
  | { admitted: true; attemptId: number }
  | { admitted: false; retryAfterSeconds: number };

/**
 * Records this attempt first, then counts the client's attempts in the
 * window including it: of any number of simultaneous requests, at most the
 * limit are admitted. A refused attempt's row is removed again, so waiting
 * out the window is enough.
 */
export async function claimSignUp(
  email: string,
  clientAddress: string,
  now = new Date(),
): Promise<SignUpClaim> {
  const windowMs = SIGN_UP_WINDOW_MINUTES * 60_000;
  const [row] = await db
    .insert(signInAttempts)
    .values({
      email: `${MARK}${email.toLowerCase()}`,
      clientAddress,
      succeeded: false,
      attemptedAt: now,
    })
    .returning({ id: signInAttempts.id });
  const [seen] = await db
    .select({ attempts: count(), oldest: min(signInAttempts.attemptedAt) })
    .from(signInAttempts)
    .where(
      and(
        eq(signInAttempts.clientAddress, clientAddress),
        like(signInAttempts.email, `${MARK}%`),
        gt(signInAttempts.attemptedAt, new Date(now.getTime() - windowMs)),
      ),
    );
  if ((seen?.attempts ?? 0) <= MAX_SIGN_UPS_PER_CLIENT)
    return { admitted: true, attemptId: row.id };
  await db.delete(signInAttempts).where(eq(signInAttempts.id, row.id));
  const until = new Date(seen.oldest ?? now).getTime() + windowMs;
  return {
    admitted: false,
    retryAfterSeconds: Math.max(1, Math.ceil((until - now.getTime()) / 1000)),
  };
}

/** Marks an admitted attempt as having created its organisation. */
export async function signUpSucceeded(attemptId: number): Promise<void> {
  await db
    .update(signInAttempts)
    .set({ succeeded: true })
    .where(eq(signInAttempts.id, attemptId));
}
