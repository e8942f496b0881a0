import { and, asc, eq } from "drizzle-orm";
import { data } from "react-router";
import { db } from "~/db/client.server";
import { memberships, organizations } from "~/db/schema";
import { isUuid } from "~/lib/ids";
import { can, type Permission, type Role } from "./permissions";
import { countWork } from "./request-counters.server";
import { requireUser, type SignedInUser } from "./session.server";

export interface OrganizationContext {
  user: SignedInUser;
  organization: { id: string; name: string };
  role: Role;
}

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

export async function findMembership(userId: string, organizationId: string) {
  if (!isUuid(organizationId)) return null;
  countWork("membershipReads");
  const [row] = await db
    .select({
      id: organizations.id,
      name: organizations.name,
      role: memberships.role,
    })
    .from(memberships)
    .innerJoin(organizations, eq(organizations.id, memberships.organizationId))
    .where(
      and(
        eq(memberships.organizationId, organizationId),
        eq(memberships.userId, userId),
      ),
    );
  return row ?? null;
}

/**
 * The signed-in user's membership of the organisation in the URL, checked for
 * a permission. An organisation the user is not a member of answers 404, the
 * same as one that does not exist, so ids reveal nothing.
 */
export async function requireMembership(
  request: Request,
  organizationId: string | undefined,
  permission: Permission = "organization.view",
): Promise<OrganizationContext> {
  const user = await requireUser(request);
  const row = organizationId
    ? await findMembership(user.id, organizationId)
    : null;
  if (!row) notFound("No such organisation.");
  if (!can(row.role, permission)) forbidden();
  return {
    user,
    organization: { id: row.id, name: row.name },
    role: row.role,
  };
}

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
