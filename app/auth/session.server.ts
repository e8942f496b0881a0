import { lucia, type AuthSession, type AuthUser } from "./lucia.server";
import { countWork } from "./request-counters.server";

export type SignedInUser = AuthUser;

/** Secure cookies whenever the request reached us over TLS. */
function isTls(request: Request): boolean {
  return new URL(request.url).protocol === "https:";
}

function serializeCookie(
  request: Request,
  cookie: ReturnType<typeof lucia.createBlankSessionCookie>,
): string {
  const serialized = cookie.serialize();
  return isTls(request) ? `${serialized}; Secure` : serialized;
}

function sessionIdFrom(request: Request): string | null {
  return lucia.readSessionCookie(request.headers.get("cookie") ?? "");
}

export interface CurrentSession {
  user: AuthUser;
  session: AuthSession;
  /** Set when lucia extended the session and the cookie must be re-sent. */
  refreshCookie: string | null;
}

export async function getCurrentSession(
  request: Request,
): Promise<CurrentSession | null> {
  const sessionId = sessionIdFrom(request);
  if (!sessionId) return null;
  countWork("sessionValidations");
  const { session, user } = await lucia.validateSession(sessionId);
  if (!session || !user) return null;
  const refreshCookie = session.fresh
    ? serializeCookie(request, lucia.createSessionCookie(session.id))
    : null;
  return { user, session, refreshCookie };
}

export async function getUser(request: Request): Promise<AuthUser | null> {
  return (await getCurrentSession(request))?.user ?? null;
}

/** Starts a session and returns the Set-Cookie header value. */
export async function startSession(
  request: Request,
  userId: string,
): Promise<string> {
  const session = await lucia.createSession(userId, {});
  return serializeCookie(request, lucia.createSessionCookie(session.id));
}

export async function endSession(request: Request): Promise<string> {
  const sessionId = sessionIdFrom(request);
  if (sessionId) await lucia.invalidateSession(sessionId);
  return serializeCookie(request, lucia.createBlankSessionCookie());
}

/** Ends every session of a user (password change or reset). */
export async function endAllSessions(userId: string): Promise<void> {
  await lucia.invalidateUserSessions(userId);
}
