import { eq, sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { users } from "~/db/schema";
import { verifyPassword } from "./password.server";
import { recordSignInAttempt, signInThrottle } from "./throttle.server";

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

export async function signIn(
  email: string,
  password: string,
  clientAddress: string,
): Promise<SignInResult> {
  const key = email.toLowerCase();
  const throttle = await signInThrottle(key, clientAddress);
  if (throttle.blocked) {
    return {
      ok: false,
      reason: "throttled",
      retryAfterSeconds: throttle.retryAfterSeconds,
    };
  }
  const user = await findUserByEmail(key);
  const valid = await verifyPassword(user?.passwordHash ?? null, password);
  await recordSignInAttempt(key, clientAddress, valid);
  if (!user || !valid) return { ok: false, reason: "invalid" };
  return { ok: true, userId: user.id };
}
