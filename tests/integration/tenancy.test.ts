import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { eq } from "drizzle-orm";
import {
  db,
  organizationId,
  pool,
  roleOf,
  schema,
  userIdByEmail,
} from "../support/db";

const invitationsTo = (email: string) =>
  db
    .select()
    .from(schema.invitations)
    .where(eq(schema.invitations.email, email));

afterAll(() => pool.end());

let larchmere: string;
let hollowmead: string;
beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  larchmere = await organizationId("Larchmere Borough Estates");
  hollowmead = await organizationId("Hollowmead Housing Co-operative");
});

/** Every organisation route built so far, as GET paths. */
const orgPages = (id: string) => [`/o/${id}`, `/o/${id}/members`];

describe("organisations cannot see each other", () => {
  it("another organisation's pages answer 404 to every role of Larchmere", async () => {
    for (const email of [
      "owner@larchmere.example",
      "manager@larchmere.example",
      "finance@larchmere.example",
      "auditor@larchmere.example",
    ]) {
      const client = new Client();
      await client.signIn(email);
      for (const path of orgPages(hollowmead)) {
        const response = await client.get(path);
        expect(response.status, `${email} ${path}`).toBe(404);
        expect(await response.text()).not.toContain("Nadia Ferreira");
      }
      for (const path of orgPages(larchmere)) {
        expect((await client.get(path)).status, `${email} ${path}`).toBe(200);
      }
    }
  });

  it("Hollowmead's owner gets 404 for Larchmere's pages and actions, and nothing changes", async () => {
    const client = new Client();
    await client.signIn("owner@hollowmead.example");
    for (const path of orgPages(larchmere))
      expect((await client.get(path)).status).toBe(404);
    const auditor = await userIdByEmail("auditor@larchmere.example");
    const attack = await client.post(`/o/${larchmere}/members`, {
      intent: "change-role",
      userId: auditor,
      role: "owner",
    });
    expect(attack.status).toBe(404);
    expect(await roleOf(larchmere, auditor)).toBe("auditor");
    const invite = await client.post(`/o/${larchmere}/members`, {
      intent: "invite",
      email: "mole@hollowmead.example",
      role: "owner",
    });
    expect(invite.status).toBe(404);
    expect(await invitationsTo("mole@hollowmead.example")).toHaveLength(0);
  });

  it("a Larchmere member id used through Hollowmead's own page is not found", async () => {
    const client = new Client();
    await client.signIn("owner@hollowmead.example");
    const larchmereAuditor = await userIdByEmail("auditor@larchmere.example");
    const response = await client.post(`/o/${hollowmead}/members`, {
      intent: "remove",
      userId: larchmereAuditor,
    });
    expect(response.status).toBe(404);
  });

  it("unknown and malformed organisation ids answer 404, signed out goes to sign-in", async () => {
    const client = new Client();
    await client.signIn("owner@larchmere.example");
    expect(
      (await client.get("/o/00000000-0000-4000-8000-000000000000")).status,
    ).toBe(404);
    expect((await client.get("/o/not-a-uuid/members")).status).toBe(404);
    const anonymous = await new Client().get(`/o/${larchmere}/members`);
    expect(anonymous.status).toBe(302);
    expect(anonymous.headers.get("location")).toContain("/sign-in?redirectTo=");
  });

  it("a member of two organisations sees both and can switch", async () => {
    const client = new Client();
    await client.signIn("consultant@fernbank.example");
    const larchmerePage = await (await client.get(`/o/${larchmere}`)).text();
    expect(larchmerePage).toContain("Hollowmead Housing Co-operative"); // in the switcher
    expect((await client.get(`/o/${hollowmead}/members`)).status).toBe(200);
  });
});
