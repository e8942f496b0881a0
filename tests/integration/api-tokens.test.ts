/**
 * Organisation API tokens: an owner creates one on the API tokens page (the
 * secret shown once, only its hash stored); the token is accepted as
 * `Authorization: Bearer jbtk_…` by its organisation's routes within its
 * role, answers as a non-member anywhere else, and is refused (401) once
 * revoked or expired. Its writes name it in the audit trail and the batch.
 */
import { createHash } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());

type Json = Record<string, unknown>;

let org: MeteredOrg;
let otherOrgId: string;
let owner: Client;
let manager: Client;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  org = await createMeteredOrg({ roles: ["owner", "energy_manager"] });
  otherOrgId = (await createOrganization(["owner"])).id;
  owner = new Client();
  await owner.signIn(org.org.members[0].email, org.org.members[0].password);
  manager = new Client();
  await manager.signIn(org.org.members[1].email, org.org.members[1].password);
});

const page = () => `/o/${org.org.id}/api-tokens`;

/** Creates a token on the page as the owner; the secret from the one answer that shows it. */
async function createToken(
  role: "auditor" | "energy_manager",
  name = `${role} tool`,
  lifetime = "90",
) {
  const response = await owner.post(page(), {
    intent: "create",
    name,
    role,
    lifetime,
  });
  expect(response.status).toBe(200);
  const secret = /jbtk_[A-Za-z0-9_-]{43}/.exec(await response.text())?.[0];
  expect(secret).toBeDefined();
  const [row] = await db
    .select()
    .from(schema.apiTokens)
    .where(
      and(
        eq(schema.apiTokens.organizationId, org.org.id),
        eq(schema.apiTokens.name, name),
      ),
    );
  return { secret: secret!, row };
}

function withToken(secret: string) {
  const bearer = { authorization: `Bearer ${secret}` };
  const client = new Client();
  return {
    get: (path: string) => client.request(path, { headers: bearer }),
    postJson: (path: string, body: unknown) =>
      client.postJson(path, body, bearer),
  };
}

async function tokenRow(id: string) {
  const [row] = await db
    .select()
    .from(schema.apiTokens)
    .where(eq(schema.apiTokens.id, id));
  return row;
}

const api = (orgId: string) => `/api/v1/orgs/${orgId}`;

describe("API tokens", () => {
  it("stores only a hash of the secret, shows it once, and audits the creation", async () => {
    const { secret, row } = await createToken("auditor", "Hash check");
    expect(secret.startsWith("jbtk_")).toBe(true);
    expect(row.tokenHash).toBe(
      createHash("sha256").update(secret).digest("hex"),
    );
    expect(JSON.stringify(row)).not.toContain(secret.slice(5));
    expect(row.expiresAt!.getTime() - row.createdAt.getTime()).toBeCloseTo(
      90 * 86_400_000,
      -4,
    );
    // A later view of the page lists the token but never shows its secret.
    const later = await (await owner.get(page())).text();
    expect(later).toContain("Hash check");
    expect(later).toContain(row.tokenPrefix);
    expect(later).not.toContain(secret);
    const [audit] = await db
      .select()
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.subject, row.id),
        ),
      );
    expect(audit).toMatchObject({
      action: "api_token.created",
      actorUserId: org.org.members[0].id,
    });
    expect(JSON.stringify(audit)).not.toContain(secret.slice(5));
  });

  it("reads its organisation's ledger and sites; another organisation answers as for a non-member", async () => {
    const { secret } = await createToken("auditor", "Reader");
    const token = withToken(secret);
    const ledger = await token.get(
      `${api(org.org.id)}/ledger?from=2026-01&to=2026-02`,
    );
    expect(ledger.status).toBe(200);
    const sites = (await (
      await token.get(`${api(org.org.id)}/sites`)
    ).json()) as { sites: Json[] };
    expect(sites.sites.map((s) => s.id)).toEqual([org.siteId]);

    // A signed-in person of this organisation asking for the other one.
    const asNonMember = await manager.get(`${api(otherOrgId)}/sites`);
    const asToken = await token.get(`${api(otherOrgId)}/sites`);
    expect(asToken.status).toBe(asNonMember.status);
    expect(asToken.status).toBe(404);
    expect(await asToken.json()).toEqual(await asNonMember.json());
    const ledgerElsewhere = await token.get(
      `${api(otherOrgId)}/ledger?from=2026-01&to=2026-02`,
    );
    expect(ledgerElsewhere.status).toBe(404);
  });

  it("an auditor token reads but cannot create a site or post readings (403), and nothing is stored", async () => {
    const token = withToken((await createToken("auditor", "Auditor")).secret);
    const site = await token.postJson(`${api(org.org.id)}/sites`, {
      name: "Refused site",
      time_zone: "Europe/London",
    });
    expect(site.status).toBe(403);
    const readings = await token.postJson(`${api(org.org.id)}/readings`, {
      readings: [
        {
          meter: org.meters.register.code,
          quantity: "electric_register",
          time: "2026-03-01T00:00:00Z",
          register_kwh: 10,
        },
      ],
    });
    expect(readings.status).toBe(403);
    const stored = await db
      .select()
      .from(schema.sites)
      .where(eq(schema.sites.organizationId, org.org.id));
    expect(stored.map((s) => s.name)).not.toContain("Refused site");
    expect((await token.get(`${api(org.org.id)}/sites`)).status).toBe(200);
  });

  it("an energy-manager token creates a site and posts readings; the audit trail and the batch name the token", async () => {
    const { secret, row } = await createToken("energy_manager", "Integrator");
    const token = withToken(secret);
    const created = await token.postJson(`${api(org.org.id)}/sites`, {
      name: "Site by token",
      time_zone: "Europe/London",
    });
    expect(created.status).toBe(201);
    const site = (await created.json()) as Json;
    const [entry] = await db
      .select()
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.subject, site.id as string),
        ),
      );
    expect(entry).toMatchObject({
      action: "site.created",
      actorUserId: null,
      actorTokenId: row.id,
    });

    // March is closed, so the readings become an adjusting entry, audited
    // under the token too.
    await db
      .insert(schema.monthCloses)
      .values({ organizationId: org.org.id, month: "2026-03-01" });
    const posted = await token.postJson(`${api(org.org.id)}/readings`, {
      readings: [0, 1].map((h) => ({
        meter: org.meters.register.code,
        quantity: "electric_register",
        time: `2026-03-01T0${h}:00:00Z`,
        register_kwh: 100 + h * 5,
      })),
    });
    expect(posted.status).toBe(200);
    const answer = (await posted.json()) as {
      batch_id: string;
      accepted: number;
    };
    expect(answer.accepted).toBe(2);
    const [batch] = await db
      .select()
      .from(schema.ingestBatches)
      .where(
        and(
          eq(schema.ingestBatches.organizationId, org.org.id),
          eq(schema.ingestBatches.id, answer.batch_id),
        ),
      );
    expect(batch).toMatchObject({
      source: "api_token",
      apiTokenId: row.id,
      userId: null,
    });

    const adjusted = await db
      .select()
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.action, "ledger.adjusted"),
        ),
      );
    expect(adjusted).toHaveLength(1);
    expect(adjusted[0]).toMatchObject({
      actorUserId: null,
      actorGatewayId: null,
      actorTokenId: row.id,
    });

    // The trail, read with an auditor token, shows the token as who acted.
    const reader = withToken((await createToken("auditor", "Trail")).secret);
    const trail = (await (
      await reader.get(`${api(org.org.id)}/audit?kind=site`)
    ).json()) as { entries: Json[] };
    const shown = trail.entries.find((e) => e.subject === "Site by token");
    expect(shown?.actor).toEqual({
      type: "token",
      id: row.id,
      name: "API token Integrator",
    });
  });

  it("records the last use at most once a minute", async () => {
    const { secret, row } = await createToken("auditor", "Last use");
    expect(row.lastUsedAt).toBeNull();
    const token = withToken(secret);
    expect((await token.get(`${api(org.org.id)}/sites`)).status).toBe(200);
    const first = (await tokenRow(row.id)).lastUsedAt;
    expect(first).not.toBeNull();
    expect(Date.now() - first!.getTime()).toBeLessThan(60_000);

    await token.get(`${api(org.org.id)}/sites`);
    expect((await tokenRow(row.id)).lastUsedAt).toEqual(first);

    const twoMinutesAgo = new Date(Date.now() - 120_000);
    await db
      .update(schema.apiTokens)
      .set({ lastUsedAt: twoMinutesAgo })
      .where(eq(schema.apiTokens.id, row.id));
    await token.get(`${api(org.org.id)}/sites`);
    expect((await tokenRow(row.id)).lastUsedAt!.getTime()).toBeGreaterThan(
      twoMinutesAgo.getTime() + 60_000,
    );
  });

  it("a revoked token answers 401; revoking asks for a confirmation and is audited", async () => {
    const { secret, row } = await createToken("auditor", "To revoke");
    const token = withToken(secret);
    const unconfirmed = await owner.post(page(), {
      intent: "revoke",
      tokenId: row.id,
    });
    expect(unconfirmed.status).toBe(400);
    expect((await tokenRow(row.id)).revokedAt).toBeNull();

    const confirmation = await (
      await owner.get(`${page()}?revoke=${row.id}`)
    )
      .text()
      .then((html) => html.replace(/<!-- -->/g, ""));
    expect(confirmation).toContain("Revoke To revoke?");
    const revoked = await owner.post(page(), {
      intent: "revoke",
      tokenId: row.id,
      confirm: "yes",
    });
    expect(revoked.status).toBe(200);
    const answer = await token.get(`${api(org.org.id)}/sites`);
    expect(answer.status).toBe(401);
    expect(await answer.json()).toMatchObject({
      error: {
        code: "invalid_token",
        message: expect.stringContaining("revoked"),
      },
    });
    const actions = await db
      .select({ action: schema.auditLog.action })
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.subject, row.id),
        ),
      );
    expect(actions.map((a) => a.action).sort()).toEqual([
      "api_token.created",
      "api_token.revoked",
    ]);
  });

  it("an expired token answers 401 with when it expired", async () => {
    const { secret, row } = await createToken("auditor", "Short-lived", "30");
    const token = withToken(secret);
    expect((await token.get(`${api(org.org.id)}/sites`)).status).toBe(200);
    await db
      .update(schema.apiTokens)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(schema.apiTokens.id, row.id));
    const answer = await token.get(`${api(org.org.id)}/sites`);
    expect(answer.status).toBe(401);
    expect(await answer.json()).toMatchObject({
      error: {
        code: "invalid_token",
        message: expect.stringContaining("expired"),
      },
    });
  });

  it("an unknown token or a gateway key on an organisation route answers 401; gateway routes refuse tokens", async () => {
    const unknown = withToken(`jbtk_${"x".repeat(43)}`);
    expect((await unknown.get(`${api(org.org.id)}/sites`)).status).toBe(401);
    const gatewayKey = withToken(org.gatewayKey);
    expect((await gatewayKey.get(`${api(org.org.id)}/sites`)).status).toBe(401);
    const { secret } = await createToken("energy_manager", "Not a gateway");
    const asGateway = await withToken(secret).postJson("/api/v1/readings", {
      readings: [
        {
          meter: org.meters.register.code,
          quantity: "electric_register",
          time: "2026-03-02T00:00:00Z",
          register_kwh: 200,
        },
      ],
    });
    expect(asGateway.status).toBe(401);
  });

  it("only an owner may see the page or create a token (403 for an energy manager)", async () => {
    expect((await manager.get(page())).status).toBe(403);
    const refused = await manager.post(page(), {
      intent: "create",
      name: "Manager's token",
      role: "energy_manager",
      lifetime: "30",
    });
    expect(refused.status).toBe(403);
    const rows = await db
      .select()
      .from(schema.apiTokens)
      .where(eq(schema.apiTokens.name, "Manager's token"));
    expect(rows).toHaveLength(0);
  });

  it("refuses an owner or finance role and an unknown lifetime, storing nothing", async () => {
    for (const fields of [
      { role: "owner", lifetime: "30" },
      { role: "finance", lifetime: "30" },
      { role: "auditor", lifetime: "7" },
    ]) {
      const response = await owner.post(page(), {
        intent: "create",
        name: "Refused token",
        ...fields,
      });
      expect(response.status).toBe(400);
    }
    const rows = await db
      .select()
      .from(schema.apiTokens)
      .where(eq(schema.apiTokens.name, "Refused token"));
    expect(rows).toHaveLength(0);
  });
});
