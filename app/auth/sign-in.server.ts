import { setTimeout as sleep } from "node:timers/promises";
import { eq, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { users } from "~/db/schema";
import { verifyPassword } from "./password.server";
import {
  attemptSucceeded,
  claimSignIn,
  isTrustedDevice,
} from "./throttle.server";
import { slowDownMs } from "./policy";
import { hashToken } from "./tokens.server";

export type SignInResult =
  | { ok: true; userId: string }
  | { ok: false; reason: "invalid" }
  | { ok: false; reason: "throttled"; retryAfterSeconds: number };

export async function findUserByEmail(email: string) {
  const [user] = await db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      passwordHash: users.passwordHash,
    })
    .from(users)
    .where(eq(sql`lower(${users.email})`, email.toLowerCase()));
  return user ?? null;
}

/**
 * Judges one password guess, if the throttle admits it. `deviceToken` is the
 * browser's device cookie (app/auth/device-cookie.server.ts), new or kept: a
 * browser that signed in to this address before is throttled on its own, and
 * a success makes this one such a browser.
 */
export async function signIn(
  email: string,
  password: string,
  clientAddress: string,
  deviceToken: string,
): Promise<SignInResult> {
  const key = email.toLowerCase();
  const deviceHash = hashToken(deviceToken);
  const trusted = await isTrustedDevice(key, deviceHash);
  const claim = await claimSignIn(
    key,
    clientAddress,
    trusted ? deviceHash : null,
  );
  if (!claim.admitted) {
    return {
      ok: false,
      reason: "throttled",
      retryAfterSeconds: claim.retryAfterSeconds,
    };
  }
  await sleep(slowDownMs(claim.rank));
  const user = await findUserByEmail(key);
  const valid = await verifyPassword(user?.passwordHash ?? null, password);
  if (!user || !valid) return { ok: false, reason: "invalid" };
  await attemptSucceeded(claim.attemptId, deviceHash);
  return { ok: true, userId: user.id };
}
