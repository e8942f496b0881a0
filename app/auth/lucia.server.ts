/**
 * The only module that talks to lucia. lucia 3 is no longer developed, so the
 * rest of the app goes through session.server.ts and could move to another
 * session library by changing this file alone.
 */
import { DrizzlePostgreSQLAdapter } from "@lucia-auth/adapter-drizzle";
import { Lucia, TimeSpan } from "lucia";
import { db } from "~/db/client.server";
import { sessions, users } from "~/db/schema";

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
