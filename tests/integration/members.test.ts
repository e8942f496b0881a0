import { and, eq } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client, latestEmailTo, linkIn, locationOf } from "../support/http";
import { createOrganization, db, pool, roleOf, schema } from "../support/db";

beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});
afterAll(() => pool.end());

async function signedIn(member: { email: string; password: string }) {
  const client = new Client();
  await client.signIn(member.email, member.password);
  return client;
}

describe("invitations", () => {
  it("an owner invites by e-mail and a new person joins with the invited role", async () => {
    const org = await createOrganization(["owner"]);
    const owner = await signedIn(org.members[0]);
    const email = `new-${org.id.slice(0, 6)}@test.example`;
    const sent = await owner.post(`/o/${org.id}/members`, {
      intent: "invite",
      email,
      role: "auditor",
    });
    expect(sent.status).toBe(200);
    const message = await latestEmailTo(email);
    expect(message?.subject).toBe(`Join ${org.name} on Joulebook`);
    const link = linkIn(message!.text);

    const invitee = new Client();
    const page = await invitee.get(link);
    expect(await page.text()).toContain("Create the account and join");
    const joined = await invitee.post(link, {
      intent: "register",
      name: "Ada Invitee",
      password: "invitee-pass-1",
      confirm: "invitee-pass-1",
    });
    expect(joined.status).toBe(302);
    expect(locationOf(joined)).toBe(`/o/${org.id}`);
    expect((await invitee.get(`/o/${org.id}/members`)).status).toBe(200);
    const [user] = await db
      .select()
      .from(schema.users)
      .where(eq(schema.users.email, email));
    expect(await roleOf(org.id, user.id)).toBe("auditor");

    // Single use: the same link cannot add anyone again.
    const again = await new Client().get(link);
    expect(await again.text()).toContain("already been accepted");
  });

  it("an expired invitation cannot be accepted", async () => {
    const org = await createOrganization(["owner"]);
    const owner = await signedIn(org.members[0]);
    const email = `late-${org.id.slice(0, 6)}@test.example`;
    await owner.post(`/o/${org.id}/members`, {
      intent: "invite",
      email,
      role: "finance",
    });
    const link = linkIn((await latestEmailTo(email))!.text);
    await db
      .update(schema.invitations)
      .set({ expiresAt: new Date(Date.now() - 60_000) })
      .where(eq(schema.invitations.organizationId, org.id));
    const page = await new Client().get(link);
    expect(await page.text()).toContain("This invitation has expired.");
    const attempt = await new Client().post(link, {
      intent: "register",
      name: "Late",
      password: "late-pass-1234",
      confirm: "late-pass-1234",
    });
    expect(attempt.status).toBe(410);
    expect(
      await db.select().from(schema.users).where(eq(schema.users.email, email)),
    ).toHaveLength(0);
  });

  it("an existing user signs in and accepts; another account cannot use the link", async () => {
    const org = await createOrganization(["owner"]);
    const other = await createOrganization(["auditor", "auditor"]);
    const owner = await signedIn(org.members[0]);
    const invitee = other.members[0];
    await owner.post(`/o/${org.id}/members`, {
      intent: "invite",
      email: invitee.email,
      role: "energy_manager",
    });
    const link = linkIn((await latestEmailTo(invitee.email))!.text);

    const wrongPerson = await signedIn(other.members[1]);
    expect((await wrongPerson.post(link, { intent: "accept" })).status).toBe(
      409,
    );

    const client = await signedIn(invitee);
    const accepted = await client.post(link, { intent: "accept" });
    expect(locationOf(accepted)).toBe(`/o/${org.id}`);
    expect(await roleOf(org.id, invitee.id)).toBe("energy_manager");
    expect(await roleOf(other.id, invitee.id)).toBe("auditor");
  });

  it("refuses bad invitation input and writes nothing", async () => {
    const org = await createOrganization(["owner"]);
    const owner = await signedIn(org.members[0]);
    const bad = await owner.post(`/o/${org.id}/members`, {
      intent: "invite",
      email: "not-an-address",
      role: "owner",
    });
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain("Enter a valid e-mail address");
    const badRole = await owner.post(`/o/${org.id}/members`, {
      intent: "invite",
      email: "x@test.example",
      role: "superuser",
    });
    expect(badRole.status).toBe(400);
    const member = await owner.post(`/o/${org.id}/members`, {
      intent: "invite",
      email: org.members[0].email,
      role: "auditor",
    });
    expect(member.status).toBe(409);
    expect(
      await db
        .select()
        .from(schema.invitations)
        .where(eq(schema.invitations.organizationId, org.id)),
    ).toHaveLength(0);
  });
});

describe("roles", () => {
  it("only owners manage members; other roles get 403 and nothing changes", async () => {
    const org = await createOrganization([
      "owner",
      "energy_manager",
      "finance",
      "auditor",
    ]);
    for (const member of org.members.slice(1)) {
      const client = await signedIn(member);
      expect((await client.get(`/o/${org.id}/members`)).status).toBe(200);
      const invite = await client.post(`/o/${org.id}/members`, {
        intent: "invite",
        email: "sneaky@test.example",
        role: "owner",
      });
      expect(invite.status).toBe(403);
      const promote = await client.post(`/o/${org.id}/members`, {
        intent: "change-role",
        userId: member.id,
        role: "owner",
      });
      expect(promote.status).toBe(403);
      expect(await roleOf(org.id, member.id)).toBe(member.role);
      const remove = await client.post(`/o/${org.id}/members`, {
        intent: "remove",
        userId: org.members[0].id,
      });
      expect(remove.status).toBe(403);
    }
    expect(await roleOf(org.id, org.members[0].id)).toBe("owner");
  });

  it("an owner changes a role and removes a member, each recorded in the audit log", async () => {
    const org = await createOrganization(["owner", "auditor", "finance"]);
    const owner = await signedIn(org.members[0]);
    const changed = await owner.post(`/o/${org.id}/members`, {
      intent: "change-role",
      userId: org.members[1].id,
      role: "energy_manager",
    });
    expect(changed.status).toBe(200);
    expect(await roleOf(org.id, org.members[1].id)).toBe("energy_manager");
    const removed = await owner.post(`/o/${org.id}/members`, {
      intent: "remove",
      userId: org.members[2].id,
    });
    expect(removed.status).toBe(200);
    expect(await roleOf(org.id, org.members[2].id)).toBeNull();
    const gone = await signedIn(org.members[2]);
    expect((await gone.get(`/o/${org.id}`)).status).toBe(404);
    const audit = await db
      .select()
      .from(schema.auditLog)
      .where(eq(schema.auditLog.organizationId, org.id));
    expect(audit.map((a) => a.action).sort()).toEqual([
      "member.removed",
      "member.role_changed",
    ]);
  });

  it("the last owner can be neither demoted nor removed", async () => {
    const org = await createOrganization(["owner", "energy_manager"]);
    const [ownerMember] = org.members;
    const owner = await signedIn(ownerMember);
    const demote = await owner.post(`/o/${org.id}/members`, {
      intent: "change-role",
      userId: ownerMember.id,
      role: "auditor",
    });
    expect(demote.status).toBe(409);
    expect(await demote.text()).toContain("at least one owner");
    const leave = await owner.post(`/o/${org.id}/members`, {
      intent: "remove",
      userId: ownerMember.id,
    });
    expect(leave.status).toBe(409);
    expect(await roleOf(org.id, ownerMember.id)).toBe("owner");

    // With a second owner, the first may step down.
    await owner.post(`/o/${org.id}/members`, {
      intent: "change-role",
      userId: org.members[1].id,
      role: "owner",
    });
    const stepDown = await owner.post(`/o/${org.id}/members`, {
      intent: "change-role",
      userId: ownerMember.id,
      role: "finance",
    });
    expect(stepDown.status).toBe(200);
    const owners = await db
      .select()
      .from(schema.memberships)
      .where(
        and(
          eq(schema.memberships.organizationId, org.id),
          eq(schema.memberships.role, "owner"),
        ),
      );
    expect(owners).toHaveLength(1);
  });

  it("two owners demoting each other at once still leave one owner", async () => {
    const org = await createOrganization(["owner", "owner"]);
    const [a, b] = await Promise.all(org.members.map((m) => signedIn(m)));
    await Promise.all([
      a.post(`/o/${org.id}/members`, {
        intent: "change-role",
        userId: org.members[1].id,
        role: "auditor",
      }),
      b.post(`/o/${org.id}/members`, {
        intent: "change-role",
        userId: org.members[0].id,
        role: "auditor",
      }),
    ]);
    const owners = await db
      .select()
      .from(schema.memberships)
      .where(
        and(
          eq(schema.memberships.organizationId, org.id),
          eq(schema.memberships.role, "owner"),
        ),
      );
    expect(owners.length).toBeGreaterThanOrEqual(1);
  });
});
