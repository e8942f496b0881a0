import { and, eq, gt, isNull } from "drizzle-orm";
import { db, type Executor } from "~/db/client.server";
import { passwordResetTokens, users } from "~/db/schema";
import { appUrl } from "~/env.server";
import { sendEmail } from "~/email/mailer.server";
import { passwordResetEmail } from "~/email/templates.server";
import { hashPassword } from "./password.server";
import { endAllSessions } from "./session.server";
import { findUserByEmail } from "./sign-in.server";
import { claimPasswordReset } from "./throttle.server";
import { hashToken, newToken } from "./tokens.server";

import { RESET_LINK_MINUTES } from "./policy";
export { RESET_LINK_MINUTES };

/**
 * Sends a reset link when the address has an account and the throttle allows
 * (a few an hour per address and per client). The caller answers the same in
 * every case, so the form reveals neither who has an account nor the limit.
 */
export async function requestPasswordReset(
  email: string,
  clientAddress: string,
): Promise<void> {
  const claim = await claimPasswordReset(email.toLowerCase(), clientAddress);
  if (!claim.admitted) return;
  const user = await findUserByEmail(email);
  if (!user) return;
  const token = newToken();
  await db.transaction(async (tx) => {
    await tx.insert(passwordResetTokens).values({
      tokenHash: hashToken(token),
      userId: user.id,
      expiresAt: new Date(Date.now() + RESET_LINK_MINUTES * 60_000),
    });
    // Inside the transaction: no stored token without a sent message.
    await sendEmail(
      passwordResetEmail(
        user.email,
        `${appUrl()}/reset-password/${token}`,
        RESET_LINK_MINUTES,
      ),
    );
  });
}

export type ResetTokenState =
  "valid" | "expired" | "used" | "ended" | "unknown";

/**
 * Ends every outstanding link of a person: called when their password
 * changes, by a reset link or on the account page, so an older link (in a
 * mailbox someone else may read) cannot set it again.
 */
export async function endResetLinks(
  executor: Executor,
  userId: string,
): Promise<void> {
  await executor
    .update(passwordResetTokens)
    .set({ endedAt: new Date() })
    .where(
      and(
        eq(passwordResetTokens.userId, userId),
        isNull(passwordResetTokens.usedAt),
        isNull(passwordResetTokens.endedAt),
      ),
    );
}

export async function resetTokenState(token: string): Promise<ResetTokenState> {
  const [row] = await db
    .select({
      expiresAt: passwordResetTokens.expiresAt,
      usedAt: passwordResetTokens.usedAt,
      endedAt: passwordResetTokens.endedAt,
    })
    .from(passwordResetTokens)
    .where(eq(passwordResetTokens.tokenHash, hashToken(token)));
  if (!row) return "unknown";
  if (row.usedAt) return "used";
  if (row.endedAt) return "ended";
  if (row.expiresAt.getTime() <= Date.now()) return "expired";
  return "valid";
}

/**
 * Spends the token (once, atomically) and sets the new password; every
 * session and every other outstanding link of the account ends. Returns the user id, or the token's state.
 */
export async function resetPassword(
  token: string,
  newPassword: string,
): Promise<
  { ok: true; userId: string } | { ok: false; state: ResetTokenState }
> {
  const passwordHash = await hashPassword(newPassword);
  const userId = await db.transaction(async (tx) => {
    const [spent] = await tx
      .update(passwordResetTokens)
      .set({ usedAt: new Date() })
      .where(
        and(
          eq(passwordResetTokens.tokenHash, hashToken(token)),
          isNull(passwordResetTokens.usedAt),
          isNull(passwordResetTokens.endedAt),
          gt(passwordResetTokens.expiresAt, new Date()),
        ),
      )
      .returning({ userId: passwordResetTokens.userId });
    if (!spent) return null;
    await tx
      .update(users)
      .set({ passwordHash })
      .where(eq(users.id, spent.userId));
    await endResetLinks(tx, spent.userId);
    return spent.userId;
  });
  if (!userId) return { ok: false, state: await resetTokenState(token) };
  await endAllSessions(userId);
  return { ok: true, userId };
}
