/**
 * Sites and meters over the JSON API with a session: an energy manager
 * creates, reads, lists, changes and archives them; the rules are the pages'
 * (bad input 400 with nothing stored, taken names and codes 409); finance and
 * auditors are refused; another organisation's ids are not found; every
 * change leaves its audit entry.
 */
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";

afterAll(() => pool.end());

type Json = Record<string, unknown>;
type Org = Awaited<ReturnType<typeof createOrganization>>;

async function signedIn(member: { email: string; password: string }) {
  const client = new Client();
  await client.signIn(member.email, member.password);
  return client;
}

function patchJson(client: Client, path: string, body: unknown) {
  return client.request(path, {
    method: "PATCH",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
}

async function auditActions(organizationId: string, subject: string) {
  const rows = await db
    .select({ action: schema.auditLog.action })
    .from(schema.auditLog)
    .where(
      and(
        eq(schema.auditLog.organizationId, organizationId),
        eq(schema.auditLog.subject, subject),
      ),
    )
    .orderBy(schema.auditLog.id);
  return rows.map((r) => r.action);
}

async function countOf(
  table: typeof schema.sites | typeof schema.meters,
  organizationId: string,
) {
  const rows = await db
    .select({ id: table.id })
    .from(table)
    .where(eq(table.organizationId, organizationId));
  return rows.length;
}

describe("provisioning sites and meters over the API", () => {
  let org: Org;
  let other: Org;
  let manager: Client;
  let finance: Client;
  let auditor: Client;
  let stranger: Client;
  let base: string;

  beforeAll(async () => {
    await db.delete(schema.signInAttempts);
    org = await createOrganization(["energy_manager", "finance", "auditor"]);
    other = await createOrganization(["energy_manager"]);
    manager = await signedIn(org.members[0]);
    finance = await signedIn(org.members[1]);
    auditor = await signedIn(org.members[2]);
    stranger = await signedIn(other.members[0]);
    base = `/api/v1/orgs/${org.id}`;
  });

  const meterBody = (siteId: string, code: string): Json => ({
    site_id: siteId,
    code,
    name: "Main incomer",
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    interval_minutes: 60,
    installed_at: "2026-01-01",
  });

  it("creates, reads, lists, updates and archives a site and a meter, each change audited", async () => {
    const created = await manager.postJson(`${base}/sites`, {
      name: "North campus",
      time_zone: "Europe/London",
      floor_area_m2: 12500,
    });
    expect(created.status).toBe(201);
    const site = (await created.json()) as Json;
    expect(site).toMatchObject({
      name: "North campus",
      time_zone: "Europe/London",
      floor_area_m2: 12500,
      degree_day_base_c: 15.5,
      archived_at: null,
    });
    const siteId = site.id as string;

    const read = await auditor.get(`${base}/sites/${siteId}`);
    expect(read.status).toBe(200);
    expect(await read.json()).toEqual(site);
    const list = (await (await finance.get(`${base}/sites`)).json()) as {
      sites: Json[];
    };
    expect(list.sites.map((s) => s.id)).toEqual([siteId]);

    const meterAnswer = await manager.postJson(
      `${base}/meters`,
      meterBody(siteId, "EM-1"),
    );
    expect(meterAnswer.status).toBe(201);
    const meter = (await meterAnswer.json()) as Json;
    expect(meter).toMatchObject({
      site_id: siteId,
      code: "EM-1",
      carrier: "electricity",
      interval_minutes: 60,
      multiplier: 1,
      installed_at: "2026-01-01T00:00:00.000Z",
      removed_at: null,
    });
    const meterId = meter.id as string;
    expect(
      await (await auditor.get(`${base}/meters/${meterId}`)).json(),
    ).toEqual(meter);
    const meters = (await (
      await auditor.get(`${base}/meters?site_id=${siteId}`)
    ).json()) as { meters: Json[] };
    expect(meters.meters.map((m) => m.id)).toEqual([meterId]);

    const patchedSite = await patchJson(manager, `${base}/sites/${siteId}`, {
      floor_area_m2: 13100,
    });
    expect(patchedSite.status).toBe(200);
    expect(await patchedSite.json()).toMatchObject({
      name: "North campus",
      floor_area_m2: 13100,
    });
    const patchedMeter = await patchJson(manager, `${base}/meters/${meterId}`, {
      name: "Main incomer (LV 1)",
    });
    expect(patchedMeter.status).toBe(200);
    expect(await patchedMeter.json()).toMatchObject({
      code: "EM-1",
      name: "Main incomer (LV 1)",
    });

    const retired = await manager.postJson(
      `${base}/meters/${meterId}/archive`,
      { removed_at: "2026-12-01", reason: "Board replaced" },
    );
    expect(retired.status).toBe(200);
    expect(await retired.json()).toMatchObject({
      removed_at: "2026-12-01T00:00:00.000Z",
    });
    const again = await manager.postJson(
      `${base}/meters/${meterId}/archive`,
      {},
    );
    expect(again.status).toBe(409);

    const archived = await manager.postJson(
      `${base}/sites/${siteId}/archive`,
      {},
    );
    expect(archived.status).toBe(200);
    expect((await archived.json()).archived_at).toEqual(expect.any(String));
    const after = (await (await manager.get(`${base}/sites`)).json()) as {
      sites: Json[];
    };
    expect(after.sites).toEqual([]);

    expect(await auditActions(org.id, siteId)).toEqual([
      "site.created",
      "site.updated",
      "site.archived",
    ]);
    expect(await auditActions(org.id, meterId)).toEqual([
      "meter.created",
      "meter.updated",
      "meter.retired",
    ]);
  });

  it("refuses finance and auditors (403) and changes nothing", async () => {
    for (const client of [finance, auditor]) {
      const response = await client.postJson(`${base}/sites`, {
        name: `Refused ${Math.random()}`,
        time_zone: "Europe/London",
      });
      expect(response.status).toBe(403);
      expect((await response.json()).error.code).toBe("forbidden");
    }
    const [site] = await db
      .insert(schema.sites)
      .values({ organizationId: org.id, name: "Finance test", timeZone: "UTC" })
      .returning();
    const patch = await patchJson(finance, `${base}/sites/${site.id}`, {
      name: "Renamed",
    });
    expect(patch.status).toBe(403);
    expect(
      (await auditor.postJson(`${base}/sites/${site.id}/archive`, {})).status,
    ).toBe(403);
    const [stored] = await db
      .select()
      .from(schema.sites)
      .where(eq(schema.sites.id, site.id));
    expect(stored).toMatchObject({ name: "Finance test", archivedAt: null });
  });

  it("answers 404 to another organisation's member and for another organisation's ids", async () => {
    const [site] = await db
      .insert(schema.sites)
      .values({ organizationId: org.id, name: "Private", timeZone: "UTC" })
      .returning();
    expect((await stranger.get(`${base}/sites/${site.id}`)).status).toBe(404);
    expect(
      (
        await stranger.postJson(`${base}/sites`, {
          name: "Intruder",
          time_zone: "UTC",
        })
      ).status,
    ).toBe(404);
    // Through the stranger's own organisation: the id is not one of theirs.
    const theirs = `/api/v1/orgs/${other.id}`;
    expect((await stranger.get(`${theirs}/sites/${site.id}`)).status).toBe(404);
    expect(
      (await patchJson(stranger, `${theirs}/sites/${site.id}`, { name: "X" }))
        .status,
    ).toBe(404);
    expect(
      (await stranger.postJson(`${theirs}/sites/${site.id}/archive`, {}))
        .status,
    ).toBe(404);
    // A meter may not be put on another organisation's site.
    const meter = await stranger.postJson(
      `${theirs}/meters`,
      meterBody(site.id, "STEAL-1"),
    );
    expect(meter.status).toBe(400);
    expect(await countOf(schema.meters, other.id)).toBe(0);
    const [stored] = await db
      .select()
      .from(schema.sites)
      .where(eq(schema.sites.id, site.id));
    expect(stored).toMatchObject({ name: "Private", archivedAt: null });
  });

  it("answers 409 to a taken site name or meter code", async () => {
    const first = await manager.postJson(`${base}/sites`, {
      name: "Depot",
      time_zone: "UTC",
    });
    expect(first.status).toBe(201);
    const siteId = ((await first.json()) as Json).id as string;
    const dup = await manager.postJson(`${base}/sites`, {
      name: "depot",
      time_zone: "UTC",
    });
    expect(dup.status).toBe(409);
    expect((await dup.json()).error.message).toBe(
      "A site with this name exists already.",
    );
    expect(
      (await manager.postJson(`${base}/meters`, meterBody(siteId, "D-1")))
        .status,
    ).toBe(201);
    const dupMeter = await manager.postJson(
      `${base}/meters`,
      meterBody(siteId, "D-1"),
    );
    expect(dupMeter.status).toBe(409);
    expect((await dupMeter.json()).error.message).toBe(
      "Another meter in this organisation uses this code.",
    );
  });

  it("answers 400 in the common error shape to bad bodies, and stores nothing", async () => {
    const sitesBefore = await countOf(schema.sites, org.id);
    const metersBefore = await countOf(schema.meters, org.id);
    const badSites: [unknown, string][] = [
      [{ name: "Nowhere", time_zone: "Mars/Olympus" }, "time_zone"],
      [{ name: "", time_zone: "UTC" }, "name"],
      [{ name: "Tiny", time_zone: "UTC", floor_area_m2: -5 }, "floor_area_m2"],
      [
        { name: "Typed", time_zone: "UTC", floor_area_m2: "big" },
        "floor_area_m2",
      ],
      [{ name: "Extra", time_zone: "UTC", colour: "red" }, "(body)"],
    ];
    for (const [body, path] of badSites) {
      const response = await manager.postJson(`${base}/sites`, body);
      expect(response.status, JSON.stringify(body)).toBe(400);
      const answer = (await response.json()) as {
        error: { code: string; issues: { path: string }[] };
      };
      expect(answer.error.code).toBe("invalid_body");
      expect(answer.error.issues.map((i) => i.path)).toContain(path);
    }
    const [site] = await db
      .insert(schema.sites)
      .values({ organizationId: org.id, name: "Bad input", timeZone: "UTC" })
      .returning();
    const good = meterBody(site.id, "B-1");
    const badMeters: [Json, string][] = [
      [{ ...good, carrier: "heat" }, "carrier"],
      [{ ...good, code: "no spaces" }, "code"],
      [{ ...good, installed_at: "" }, "installed_at"],
      [{ ...good, interval_minutes: 20 }, "interval_minutes"],
      [{ ...good, interval_minutes: 90 }, "interval_minutes"],
    ];
    for (const [body, path] of badMeters) {
      const response = await manager.postJson(`${base}/meters`, body);
      expect(response.status, JSON.stringify(body)).toBe(400);
      const answer = (await response.json()) as {
        error: { issues: { path: string; message: string }[] };
      };
      expect(answer.error.issues.map((i) => i.path)).toContain(path);
      if (path === "interval_minutes")
        expect(answer.error.issues[0].message).toMatch(
          /interval_minutes must be 15, 30 or 60/,
        );
    }
    const badJson = await manager.postJson(`${base}/sites`, "{not json");
    expect(badJson.status).toBe(400);
    expect((await badJson.json()).error.code).toBe("invalid_json");
    // A bad PATCH leaves the site as it was.
    const patch = await patchJson(manager, `${base}/sites/${site.id}`, {
      time_zone: "Nowhere/Else",
    });
    expect(patch.status).toBe(400);
    expect(await countOf(schema.sites, org.id)).toBe(sitesBefore + 1);
    expect(await countOf(schema.meters, org.id)).toBe(metersBefore);
    const [stored] = await db
      .select()
      .from(schema.sites)
      .where(eq(schema.sites.id, site.id));
    expect(stored.timeZone).toBe("UTC");
  });
});
