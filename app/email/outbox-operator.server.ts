import { createHash, timingSafeEqual } from "node:crypto";
import { createCookie } from "react-router";
import { env } from "~/env.server";

/**
 * The operator of the machine that runs the local e-mail fake may read every
 * message in the Outbox, including reset links and invitations for people
 * who cannot sign in yet. `npm start` makes a random key once (kept in the
 * data folder) and prints a link carrying it; opening the link trades the
 * key for a cookie limited to the Outbox, so the key leaves the address bar.
 */
const operatorCookie = createCookie("jb_outbox_operator", {
  httpOnly: true,
  sameSite: "strict",
  path: "/operator/outbox",
  maxAge: 7 * 86_400,
});

function digest(value: string): Buffer {
  return createHash("sha256").update(value).digest();
}

/** Constant-time comparison with the configured key; false when none is set. */
export function isOperatorKey(candidate: unknown): boolean {
  const key = env().OUTBOX_OPERATOR_KEY;
  if (!key || typeof candidate !== "string") return false;
  return timingSafeEqual(digest(candidate), digest(key));
}

export async function operatorKeyCookie(key: string): Promise<string> {
  return operatorCookie.serialize(key);
}

export async function hasOperatorCookie(request: Request): Promise<boolean> {
  return isOperatorKey(
    await operatorCookie.parse(request.headers.get("cookie")),
  );
}
