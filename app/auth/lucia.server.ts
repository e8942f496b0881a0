/**
 * The only module that imports lucia (and its adapter). lucia 3 is no longer
 * developed, so the rest of the app goes through session.server.ts and could
 * move to another session library by changing this file alone
 * (docs/architecture.md says what that would take).
 */
import { DrizzlePostgreSQLAdapter } from "@lucia-auth/adapter-drizzle";
import { Lucia, TimeSpan, type Session, type User } from "lucia";
import { db } from "~/db/client.server";
import { sessions, users } from "~/db/schema";

/** lucia's records under the app's own names, so no other module imports lucia. */
export type AuthSession = Session;
export type AuthUser = User;

const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users);

export const lucia = new Lucia(adapter, {
  sessionExpiresIn: new TimeSpan(30, "d"),
  sessionCookie: {
    name: "jb_session",
    // Secure is decided per request in session.server.ts (TLS or not).
    attributes: { secure: false, sameSite: "lax" },
  },
  getUserAttributes: (attributes) => ({
    email: attributes.email,
    name: attributes.name,
  }),
});

declare module "lucia" {
  interface Register {
    Lucia: typeof lucia;
    DatabaseUserAttributes: { email: string; name: string };
  }
}
