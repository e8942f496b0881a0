/**
 * Records of signing in that have served their purpose are deleted on a
 * schedule, so the tables the throttles count stay small and nobody's
 * attempts are kept longer than they are needed.
 */
import { and, eq, lt, or, isNull } from "drizzle-orm";
import { db } from "~/db/client.server";
import { passwordResetTokens, sessions, signInAttempts } from "~/db/schema";
import {
  RESET_WINDOW_MINUTES,
  SIGN_IN_WINDOW_MINUTES,
  SIGN_UP_WINDOW_MINUTES,
  TRUSTED_DEVICE_DAYS,
} from "./throttle.server";

const DAY_MS = 86_400_000;
/** Attempts are kept a day past the longest throttle window, for support questions. */
const ATTEMPT_KEEP_MS =
  Math.max(
    SIGN_IN_WINDOW_MINUTES,
    RESET_WINDOW_MINUTES,
    SIGN_UP_WINDOW_MINUTES,
  ) *
    60_000 +
  DAY_MS;

export interface Pruned {
  sessions: number;
  attempts: number;
  resetLinks: number;
}

export async function pruneAuthRecords(now = new Date()): Promise<Pruned> {
  const attemptsBefore = new Date(now.getTime() - ATTEMPT_KEEP_MS);
  const trustedBefore = new Date(now.getTime() - TRUSTED_DEVICE_DAYS * DAY_MS);
  const expiredSessions = await db
    .delete(sessions)
    .where(lt(sessions.expiresAt, now))
    .returning({ id: sessions.id });
  // A successful sign-in from a trusted browser is what trusts it: kept for
  // the trust's lifetime; every other attempt only for the windows.
  const attempts = await db
    .delete(signInAttempts)
    .where(
      or(
        and(
          lt(signInAttempts.attemptedAt, attemptsBefore),
          or(
            eq(signInAttempts.succeeded, false),
            isNull(signInAttempts.deviceHash),
          ),
        ),
        lt(signInAttempts.attemptedAt, trustedBefore),
      ),
    )
    .returning({ id: signInAttempts.id });
  const resetLinks = await db
    .delete(passwordResetTokens)
    .where(lt(passwordResetTokens.expiresAt, new Date(now.getTime() - DAY_MS)))
    .returning({ hash: passwordResetTokens.tokenHash });
  return {
    sessions: expiredSessions.length,
    attempts: attempts.length,
    resetLinks: resetLinks.length,
  };
}
