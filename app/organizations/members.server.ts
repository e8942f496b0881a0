import { and, asc, count, desc, eq, gt, isNull, sql } from "drizzle-orm";
import { db, type Transaction } from "~/db/client.server";
import { invitations, memberships, organizations, users } from "~/db/schema";
import { recordAudit } from "~/audit/record-audit.server";
import { appUrl } from "~/env.server";
import { sendEmail } from "~/email/mailer.server";
import { invitationEmail } from "~/email/templates.server";
import {
  roleLabels,
  wouldRemoveLastOwner,
  type Role,
} from "~/auth/permissions";
import { hashToken, newToken } from "~/auth/tokens.server";

import { INVITATION_DAYS } from "~/auth/policy";

export class MembershipRuleError extends Error {}

/** The one membership of a person in an organisation. */
function membershipKey(organizationId: string, userId: string) {
  return and(
    eq(memberships.organizationId, organizationId),
    eq(memberships.userId, userId),
  );
}

export async function listMembers({
  organizationId,
}: {
  organizationId: string;
}) {
  return db
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      joinedAt: memberships.createdAt,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.organizationId, organizationId))
    .orderBy(asc(users.name));
}

export async function listPendingInvitations({
  organizationId,
}: {
  organizationId: string;
}) {
  return db
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      createdAt: invitations.createdAt,
    })
    .from(invitations)
    .where(
      and(
        eq(invitations.organizationId, organizationId),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, new Date()),
      ),
    )
    .orderBy(desc(invitations.createdAt));
}

/**
 * Locks the organisation's memberships for the rest of the transaction, so
 * two owners demoting each other at once cannot leave the organisation with
 * none.
 */
async function lockedMembers(tx: Transaction, organizationId: string) {
  return tx
    .select({ userId: memberships.userId, role: memberships.role })
    .from(memberships)
    .where(eq(memberships.organizationId, organizationId))
    .for("update");
}

async function guardedMemberChange(
  tx: Transaction,
  organizationId: string,
  userId: string,
  nextRole: Role | null,
) {
  const members = await lockedMembers(tx, organizationId);
  const target = members.find((m) => m.userId === userId);
  if (!target) return null;
  const owners = members.filter((m) => m.role === "owner").length;
  if (wouldRemoveLastOwner(owners, target.role, nextRole)) {
    throw new MembershipRuleError(
      "An organisation needs at least one owner. Make someone else an owner first.",
    );
  }
  return target;
}

/** Changes a member's role; null when the user is not a member here. */
export async function changeMemberRole(args: {
  organizationId: string;
  actorUserId: string;
  userId: string;
  role: Role;
}): Promise<{ from: Role; to: Role } | null> {
  return db.transaction(async (tx) => {
    const target = await guardedMemberChange(
      tx,
      args.organizationId,
      args.userId,
      args.role,
    );
    if (!target) return null;
    await tx
      .update(memberships)
      .set({ role: args.role })
      .where(membershipKey(args.organizationId, args.userId));
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "member.role_changed",
      subject: args.userId,
      before: { role: target.role },
      after: { role: args.role },
    });
    return { from: target.role, to: args.role };
  });
}

export async function removeMember(args: {
  organizationId: string;
  actorUserId: string;
  userId: string;
}): Promise<boolean> {
  return db.transaction(async (tx) => {
    const target = await guardedMemberChange(
      tx,
      args.organizationId,
      args.userId,
      null,
    );
    if (!target) return false;
    await tx
      .delete(memberships)
      .where(membershipKey(args.organizationId, args.userId));
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "member.removed",
      subject: args.userId,
      before: { role: target.role },
    });
    return true;
  });
}

export async function inviteMember(args: {
  organizationId: string;
  organizationName: string;
  actor: { id: string; name: string };
  email: string;
  role: Role;
}): Promise<"invited" | "already_member"> {
  const email = args.email.toLowerCase();
  const token = newToken();
  return db.transaction(async (tx) => {
    const [existing] = await tx
      .select({ userId: memberships.userId })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(
        and(
          eq(memberships.organizationId, args.organizationId),
          eq(sql`lower(${users.email})`, email),
        ),
      );
    if (existing) return "already_member";
    const [invitation] = await tx
      .insert(invitations)
      .values({
        organizationId: args.organizationId,
        email,
        role: args.role,
        tokenHash: hashToken(token),
        invitedByUserId: args.actor.id,
        expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
      })
      .returning({ id: invitations.id });
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actor.id,
      action: "invitation.created",
      subject: invitation.id,
      after: { email, role: args.role },
    });
    // Sent before commit: an invitation exists only if its e-mail went out.
    await sendEmail(
      invitationEmail({
        to: email,
        organizationId: args.organizationId,
        organizationName: args.organizationName,
        inviterName: args.actor.name,
        roleLabel: roleLabels[args.role],
        url: `${appUrl()}/invitations/${token}`,
        days: INVITATION_DAYS,
      }),
    );
    return "invited";
  });
}

export async function revokeInvitation(args: {
  organizationId: string;
  actorUserId: string;
  invitationId: string;
}): Promise<boolean> {
  return db.transaction(async (tx) => {
    const revoked = await tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(
        and(
          eq(invitations.organizationId, args.organizationId),
          eq(invitations.id, args.invitationId),
          isNull(invitations.acceptedAt),
          isNull(invitations.revokedAt),
        ),
      )
      .returning({ email: invitations.email, role: invitations.role });
    if (revoked.length === 0) return false;
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "invitation.revoked",
      subject: args.invitationId,
      before: { state: "open" },
      after: { state: "withdrawn" },
      details: revoked[0],
    });
    return true;
  });
}

export type InvitationState =
  "valid" | "expired" | "accepted" | "revoked" | "unknown";

export async function findInvitation(token: string) {
  const [row] = await db
    .select({
      organizationId: invitations.organizationId,
      id: invitations.id,
      organizationName: organizations.name,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      acceptedAt: invitations.acceptedAt,
      revokedAt: invitations.revokedAt,
    })
    .from(invitations)
    .innerJoin(organizations, eq(organizations.id, invitations.organizationId))
    .where(eq(invitations.tokenHash, hashToken(token)));
  if (!row) return { state: "unknown" as InvitationState, invitation: null };
  const state: InvitationState = row.acceptedAt
    ? "accepted"
    : row.revokedAt
      ? "revoked"
      : row.expiresAt.getTime() <= Date.now()
        ? "expired"
        : "valid";
  return { state, invitation: row };
}

/**
 * Spends the invitation for a user whose e-mail matches it and adds the
 * membership, both in one transaction.
 */
export type AcceptResult =
  { ok: true; organizationId: string } | { ok: false; reason: string };

export async function acceptInvitation(args: {
  token: string;
  userId: string;
  userEmail: string;
}): Promise<AcceptResult> {
  return db.transaction((tx) => acceptInvitationIn(tx, args));
}

/** The same inside a caller's transaction (sign-up and accept together). */
export async function acceptInvitationIn(
  tx: Transaction,
  args: { token: string; userId: string; userEmail: string },
): Promise<AcceptResult> {
  {
    const [spent] = await tx
      .update(invitations)
      .set({ acceptedAt: new Date() })
      .where(
        and(
          eq(invitations.tokenHash, hashToken(args.token)),
          isNull(invitations.acceptedAt),
          isNull(invitations.revokedAt),
          gt(invitations.expiresAt, new Date()),
          eq(invitations.email, args.userEmail.toLowerCase()),
        ),
      )
      .returning({
        organizationId: invitations.organizationId,
        id: invitations.id,
        role: invitations.role,
      });
    if (!spent) {
      return {
        ok: false,
        reason: "This invitation is no longer valid for this account.",
      };
    }
    await tx
      .insert(memberships)
      .values({
        organizationId: spent.organizationId,
        userId: args.userId,
        role: spent.role,
      })
      .onConflictDoNothing();
    await recordAudit(tx, {
      organizationId: spent.organizationId,
      actorUserId: args.userId,
      action: "invitation.accepted",
      subject: spent.id,
      after: { role: spent.role },
    });
    return { ok: true, organizationId: spent.organizationId };
  }
}

export async function countOwners(organizationId: string): Promise<number> {
  const [row] = await db
    .select({ owners: count() })
    .from(memberships)
    .where(
      and(
        eq(memberships.organizationId, organizationId),
        eq(memberships.role, "owner"),
      ),
    );
  return row?.owners ?? 0;
}
