import { and, count, eq, gt, min } from "drizzle-orm";
import { db } from "~/db/client.server";
import { signInAttempts } from "~/db/schema";

/**
 * Repeated failed sign-ins are slowed down per e-mail address (guessing one
 * account's password) and per client address (trying many accounts).
 */
export const THROTTLE_WINDOW_MINUTES = 15;
export const MAX_FAILURES_PER_EMAIL = 5;
export const MAX_FAILURES_PER_CLIENT = 30;

export interface ThrottleState {
  blocked: boolean;
  retryAfterSeconds: number;
}

async function failuresSince(
  column: typeof signInAttempts.email | typeof signInAttempts.clientAddress,
  value: string,
  since: Date,
) {
  const [row] = await db
    .select({ failures: count(), oldest: min(signInAttempts.attemptedAt) })
    .from(signInAttempts)
    .where(
      and(
        eq(column, value),
        eq(signInAttempts.succeeded, false),
        gt(signInAttempts.attemptedAt, since),
      ),
    );
  return { failures: row?.failures ?? 0, oldest: row?.oldest ?? null };
}

export async function signInThrottle(
  email: string,
  clientAddress: string,
  now = new Date(),
): Promise<ThrottleState> {
  const windowMs = THROTTLE_WINDOW_MINUTES * 60_000;
  const since = new Date(now.getTime() - windowMs);
  const [byEmail, byClient] = await Promise.all([
    failuresSince(signInAttempts.email, email, since),
    failuresSince(signInAttempts.clientAddress, clientAddress, since),
  ]);
  const over =
    byEmail.failures >= MAX_FAILURES_PER_EMAIL
      ? byEmail
      : byClient.failures >= MAX_FAILURES_PER_CLIENT
        ? byClient
        : null;
  if (!over?.oldest) return { blocked: false, retryAfterSeconds: 0 };
  const until = new Date(over.oldest).getTime() + windowMs;
  return {
    blocked: true,
    retryAfterSeconds: Math.max(1, Math.ceil((until - now.getTime()) / 1000)),
  };
}

export async function recordSignInAttempt(
  email: string,
  clientAddress: string,
  succeeded: boolean,
): Promise<void> {
  await db.insert(signInAttempts).values({ email, clientAddress, succeeded });
}
