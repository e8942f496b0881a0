import { createCookie } from "react-router";
import { TRUSTED_DEVICE_DAYS } from "./throttle.server";
import { newToken } from "./tokens.server";

/**
 * A browser that has signed in successfully keeps a random token, only its
 * hash stored beside its sign-in attempts. It lets the sign-in throttle tell
 * a person's own browser from a stranger behind the same client address
 * (app/auth/throttle.server.ts). It carries no identity and grants nothing.
 */
const deviceCookie = createCookie("jb_device", {
  httpOnly: true,
  sameSite: "lax",
  path: "/",
  maxAge: TRUSTED_DEVICE_DAYS * 86_400,
});

export async function readDeviceToken(
  request: Request,
): Promise<string | null> {
  const value: unknown = await deviceCookie.parse(
    request.headers.get("cookie"),
  );
  return typeof value === "string" && /^[\w-]{20,100}$/.test(value)
    ? value
    : null;
}

/** The browser's token, kept when it has one, and its Set-Cookie header. */
export async function deviceTokenCookie(
  request: Request,
  existing: string | null,
): Promise<{ token: string; setCookie: string }> {
  const token = existing ?? newToken();
  const secure = new URL(request.url).protocol === "https:";
  return { token, setCookie: await deviceCookie.serialize(token, { secure }) };
}
