import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, organizationId, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";
import { meterFormFields } from "../support/forms";

afterAll(() => pool.end());

let larchmere: string;
let theirs: MeteredOrg;
beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  larchmere = await organizationId("Larchmere Borough Estates");
  theirs = await createMeteredOrg({ roles: ["owner"] });
});

async function as(email: string) {
  const client = new Client();
  await client.signIn(email);
  return client;
}

describe("sites, meters, readings and gateways stay inside their organisation", () => {
  it("another organisation's site, meter and readings answer 404, through either organisation's path", async () => {
    const owner = await as("owner@larchmere.example");
    const paths = [
      `/o/${theirs.org.id}/sites`,
      `/o/${theirs.org.id}/sites/${theirs.siteId}`,
      `/o/${larchmere}/sites/${theirs.siteId}`,
      `/o/${larchmere}/sites/${theirs.siteId}/meters/new`,
      `/o/${larchmere}/meters/${theirs.meters.water.id}`,
      `/o/${larchmere}/meters/${theirs.meters.water.id}/readings`,
      `/o/${theirs.org.id}/readings`,
      `/o/${theirs.org.id}/gateways`,
      `/api/v1/orgs/${larchmere}/meters/${theirs.meters.water.id}/intervals`,
      `/api/v1/orgs/${theirs.org.id}/meters/${theirs.meters.water.id}/intervals`,
    ];
    for (const path of paths) {
      expect((await owner.get(path)).status, path).toBe(404);
    }
  });

  it("changes aimed at another organisation's records answer 404 and change nothing", async () => {
    const owner = await as("owner@larchmere.example");
    const site = await owner.post(`/o/${larchmere}/sites/${theirs.siteId}`, {
      intent: "save-site",
      name: "Taken over",
      timeZone: "Europe/London",
      floorAreaM2: "",
      degreeDayBaseC: "15.5",
      address: "",
    });
    expect(site.status).toBe(404);
    const retire = await owner.post(
      `/o/${larchmere}/meters/${theirs.meters.water.id}`,
      { intent: "retire", removedAt: "2026-01-01" },
    );
    expect(retire.status).toBe(404);
    const revoke = await owner.post(`/o/${larchmere}/gateways`, {
      intent: "revoke",
      gatewayId: theirs.gatewayId,
      confirm: "yes",
    });
    expect(revoke.status).toBe(404);
    const edit = await owner.post(
      `/o/${larchmere}/meters/${theirs.meters.water.id}/readings`,
      {
        intent: "edit",
        intervalStart: "2026-01-01T00:00:00Z",
        energyKwh: "1",
        reason: "not ours to edit",
      },
    );
    expect(edit.status).toBe(404);
    const [meter] = await db
      .select()
      .from(schema.meters)
      .where(eq(schema.meters.id, theirs.meters.water.id));
    expect(meter.removedAt).toBeNull();
    const [gateway] = await db
      .select()
      .from(schema.gateways)
      .where(eq(schema.gateways.id, theirs.gatewayId));
    expect(gateway.revokedAt).toBeNull();
    const [theirSite] = await db
      .select()
      .from(schema.sites)
      .where(eq(schema.sites.id, theirs.siteId));
    expect(theirSite.name).not.toBe("Taken over");
  });
});

describe("roles on the estate", () => {
  it("finance and auditors read sites and readings but cannot change them or see gateways", async () => {
    for (const email of [
      "finance@larchmere.example",
      "auditor@larchmere.example",
    ]) {
      const client = await as(email);
      expect((await client.get(`/o/${larchmere}/sites`)).status).toBe(200);
      expect((await client.get(`/o/${larchmere}/readings`)).status).toBe(200);
      expect((await client.get(`/o/${larchmere}/gateways`)).status, email).toBe(
        403,
      );
      const create = await client.post(`/o/${larchmere}/sites`, {
        intent: "save-site",
        name: `Not allowed ${email}`,
        timeZone: "Europe/London",
        floorAreaM2: "",
        degreeDayBaseC: "15.5",
        address: "",
      });
      expect(create.status).toBe(403);
      const gw = await client.post(`/o/${larchmere}/gateways`, {
        intent: "create",
        name: "sneaky",
      });
      expect(gw.status).toBe(403);
    }
    const created = await db
      .select()
      .from(schema.sites)
      .where(eq(schema.sites.organizationId, larchmere));
    expect(
      created.filter((s) => s.name.startsWith("Not allowed")),
    ).toHaveLength(0);
  });

  it("an energy manager creates a site and a meter, with clear errors for bad input", async () => {
    const manager = await as("manager@larchmere.example");
    const bad = await manager.post(`/o/${larchmere}/sites`, {
      intent: "save-site",
      name: "",
      timeZone: "Mars/Olympus",
      floorAreaM2: "big",
      degreeDayBaseC: "15.5",
      address: "",
    });
    expect(bad.status).toBe(400);
    const text = await bad.text();
    expect(text).toContain("Enter the site&#x27;s name.");
    expect(text).toContain("Not a time zone");
    expect(text).toContain("Floor area must be a number.");
    const name = `Annexe ${Date.now()}`;
    const ok = await manager.post(`/o/${larchmere}/sites`, {
      intent: "save-site",
      name,
      timeZone: "Europe/London",
      floorAreaM2: "420",
      degreeDayBaseC: "15.5",
      address: "1 Test Row",
    });
    expect(ok.status).toBe(302);
    const siteId = ok.headers.get("location")!.split("/").pop()!;
    const dup = await manager.post(`/o/${larchmere}/sites`, {
      intent: "save-site",
      name,
      timeZone: "Europe/London",
      floorAreaM2: "",
      degreeDayBaseC: "15.5",
      address: "",
    });
    expect(dup.status).toBe(409);
    const meterFields = meterFormFields({
      code: `AX-${Date.now()}`,
      name: "Annexe heat",
      quantity: "water_heat",
      multiplier: "1",
      spikeFactor: "10",
      installedAt: "2026-01-01",
    });
    const wrong = await manager.post(
      `/o/${larchmere}/sites/${siteId}/meters/new`,
      meterFields,
    );
    expect(wrong.status).toBe(400);
    const wrongText = await wrong.text();
    expect(wrongText).toContain("accounts for heat or cooling");
    expect(wrongText).toContain("Say which pipe the flow sensor sits in.");
    const made = await manager.post(
      `/o/${larchmere}/sites/${siteId}/meters/new`,
      { ...meterFields, carrier: "heat", sensorAt: "return" },
    );
    expect(made.status).toBe(302);
    const audit = await db
      .select()
      .from(schema.auditLog)
      .where(eq(schema.auditLog.organizationId, larchmere));
    expect(audit.map((a) => a.action)).toEqual(
      expect.arrayContaining(["site.created", "meter.created"]),
    );
  });
});
