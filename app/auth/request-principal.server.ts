/**
 * Who is asking, resolved once per request: the signed-in person (one
 * session validation) and, on an organisation's pages and API routes, their
 * organisation and role (one read of their memberships). Pages reach it
 * through React Router middleware and `context` (page-access.server.ts), the
 * JSON API through `res.locals` (app/api/principal.server.ts); both then ask
 * `can(role, permission)` of the one permission table (permissions.ts).
 */
import { listMemberships } from "./membership.server";
import type { Role } from "./permissions";
import { getCurrentSession, type SignedInUser } from "./session.server";

/** A signed-in person's organisation and role in it. */
export interface OrganizationContext {
  user: SignedInUser;
  organization: { id: string; name: string };
  role: Role;
}

export type MembershipSummary = Awaited<
  ReturnType<typeof listMemberships>
>[number];

export class RequestPrincipal {
  private membershipsRead: Promise<MembershipSummary[]> | null = null;

  private constructor(
    readonly user: SignedInUser,
    /** Set when the session was extended: send it back as Set-Cookie. */
    readonly refreshCookie: string | null,
  ) {}

  /**
   * The person signed in on `request` (its cookie), or null: no cookie, or a
   * session that ended. Validates the session; call it once per request.
   */
  static async resolve(request: Request): Promise<RequestPrincipal | null> {
    const current = await getCurrentSession(request);
    return current
      ? new RequestPrincipal(current.user, current.refreshCookie)
      : null;
  }

  /** Every organisation the person belongs to, by name; read once per request. */
  memberships(): Promise<MembershipSummary[]> {
    this.membershipsRead ??= listMemberships(this.user.id);
    return this.membershipsRead;
  }

  /**
   * The person's organisation and role for an id from a URL, or null when
   * they are not a member: not a member, no such organisation and no id at
   * all look the same, so ids reveal nothing.
   */
  async membershipOf(
    organizationId: string | undefined,
  ): Promise<OrganizationContext | null> {
    if (!organizationId) return null;
    // PostgreSQL reads a uuid in any case and answers in lower case.
    const wanted = organizationId.toLowerCase();
    const row = (await this.memberships()).find((org) => org.id === wanted);
    if (!row) return null;
    return {
      user: this.user,
      organization: { id: row.id, name: row.name },
      role: row.role,
    };
  }
}
