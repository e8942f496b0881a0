import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { users } from "~/db/schema";
import { endResetLinks } from "./password-reset.server";
import { hashPassword, verifyPassword } from "./password.server";
import { endAllSessions, startSession } from "./session.server";

/**
 * Checks the current password, stores the new one and ends every session and
 * outstanding reset link of the account; the caller's device gets a fresh
 * session cookie back.
 */
export async function changePassword(
  request: Request,
  userId: string,
  current: string,
  next: string,
): Promise<{ ok: true; cookie: string } | { ok: false }> {
  const [user] = await db
    .select({ passwordHash: users.passwordHash })
    .from(users)
    .where(eq(users.id, userId));
  if (!user || !(await verifyPassword(user.passwordHash, current)))
    return { ok: false };
  const passwordHash = await hashPassword(next);
  await db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, userId));
    await endResetLinks(tx, userId);
  });
  await endAllSessions(userId);
  return { ok: true, cookie: await startSession(request, userId) };
}
