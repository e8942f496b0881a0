import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db, pool, schema } from "../support/db";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());

let org: MeteredOrg;
let owner: Client;
const lastSeenAt = new Date(Date.now() - 4 * 60_000);

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  org = await createMeteredOrg({ roles: ["owner"] });
  await db
    .update(schema.gateways)
    .set({ lastSeenAt })
    .where(eq(schema.gateways.id, org.gatewayId));
  owner = new Client();
  const [member] = org.org.members;
  await owner.signIn(member.email, member.password);
});

async function gateway() {
  const [row] = await db
    .select()
    .from(schema.gateways)
    .where(eq(schema.gateways.id, org.gatewayId));
  return row;
}

async function revocationsAudited() {
  const rows = await db
    .select()
    .from(schema.auditLog)
    .where(
      and(
        eq(schema.auditLog.organizationId, org.org.id),
        eq(schema.auditLog.action, "gateway.revoked"),
      ),
    );
  return rows.length;
}

describe("revoking a gateway takes a confirmation", () => {
  it("a revoke POST without the confirmation is refused and changes nothing", async () => {
    const response = await owner.post(`/o/${org.org.id}/gateways`, {
      intent: "revoke",
      gatewayId: org.gatewayId,
    });
    expect(response.status).toBe(400);
    expect(await response.text()).toContain("Confirm the revocation first");
    expect((await gateway()).revokedAt).toBeNull();
    expect(await revocationsAudited()).toBe(0);
  });

  it("the list offers Revoke… as a step; the confirmation names the gateway and when it was last seen", async () => {
    const list = await (await owner.get(`/o/${org.org.id}/gateways`)).text();
    expect(list).toContain(
      `href="/o/${org.org.id}/gateways?revoke=${org.gatewayId}"`,
    );
    expect(list).not.toContain('name="confirm"');

    const page = await owner.get(
      `/o/${org.org.id}/gateways?revoke=${org.gatewayId}`,
    );
    expect(page.status).toBe(200);
    const html = (await page.text()).replace(/<!-- -->/g, "");
    const name = `Test gateway ${org.tag}`;
    expect(html).toContain(`Revoke ${name}?`);
    const utc = lastSeenAt.toISOString().slice(11, 16);
    expect(html).toMatch(
      new RegExp(
        `It was last seen <time[^>]*>4 minutes ago</time> \\([^)]*${utc} UTC\\)`,
      ),
    );
    expect(html).toContain('name="confirm" value="yes"');
  });

  it("a malformed or unknown ?revoke= shows the plain list", async () => {
    for (const revoke of ["x", "00000000-0000-4000-8000-000000000000"]) {
      const page = await owner.get(
        `/o/${org.org.id}/gateways?revoke=${revoke}`,
      );
      expect(page.status).toBe(200);
      expect(await page.text()).not.toContain('name="confirm"');
    }
  });

  it("the confirmed revocation cuts the gateway off, once", async () => {
    const response = await owner.post(`/o/${org.org.id}/gateways`, {
      intent: "revoke",
      gatewayId: org.gatewayId,
      confirm: "yes",
    });
    expect(response.status).toBe(200);
    expect(await response.text()).toContain("Gateway revoked");
    expect((await gateway()).revokedAt).not.toBeNull();
    expect(await revocationsAudited()).toBe(1);
    const refused = await owner.postJson(
      "/api/v1/readings",
      { readings: [] },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(refused.status).toBe(401);
  });
});
