import { asc, eq } from "drizzle-orm";
import { data } from "react-router";
import { db } from "~/db/client.server";
import { memberships, organizations } from "~/db/schema";
import { isUuid } from "~/lib/ids";
import { countWork } from "./request-counters.server";

export function notFound(message = "Not found"): never {
  throw data({ message }, { status: 404 });
}

/**
 * An id from the page's URL (`:siteId`, `:meterId`, `:reportId`): any other
 * shape answers 404 with the same message as an id that does not exist,
 * before it can reach a query as a malformed uuid.
 */
export function idParam(value: string | undefined, message: string): string {
  if (!isUuid(value)) notFound(message);
  return value;
}

export function forbidden(message = "Your role does not allow this."): never {
  throw data({ message }, { status: 403 });
}

/**
 * Every organisation a person belongs to, with their role, by name. The
 * request resolver (request-principal.server.ts) reads it once per request;
 * it is also the organisation switcher's list.
 */
export async function listMemberships(userId: string) {
  countWork("membershipReads");
  return db
    .select({
      id: organizations.id,
      name: organizations.name,
      role: memberships.role,
    })
    .from(memberships)
    .innerJoin(organizations, eq(organizations.id, memberships.organizationId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(organizations.name));
}
