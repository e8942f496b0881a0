/**
 * Input that PostgreSQL or the app's own rules refuse is answered with a 4xx
 * and a reason, never a 500, and changes nothing it should not.
 */
import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";
import { meterFormFields } from "../support/forms";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

type Answer = {
  accepted: number;
  rejected: { index: number; reason: string; meter?: string }[];
};

/** One hour of heating water, 75/50 °C (the meter supplies pressure and sensor). */
function water(org: MeteredOrg, hour: string, meter = org.meters.water.code) {
  const start = new Date(`${hour}:00:00Z`);
  return {
    meter,
    quantity: "water_heat",
    start: start.toISOString(),
    end: new Date(start.getTime() + 3_600_000).toISOString(),
    volume_m3: 2,
    flow_temp_c: 75,
    return_temp_c: 50,
  };
}

async function signedIn(org: MeteredOrg): Promise<Client> {
  const client = new Client();
  const [member] = org.org.members;
  await client.signIn(member.email, member.password);
  return client;
}

async function rawCount(org: MeteredOrg): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(schema.rawReadings)
    .where(eq(schema.rawReadings.organizationId, org.org.id));
  return row.n;
}

describe("strings PostgreSQL cannot store fail one reading, not the batch", () => {
  it("a NUL byte in the middle reading's meter rejects that reading; the other two are stored", async () => {
    const org = await createMeteredOrg();
    const readings = [
      water(org, "2026-04-01T08"),
      water(org, "2026-04-01T09", `${org.meters.water.code}\u0000`),
      water(org, "2026-04-01T10"),
    ];
    const response = await new Client().postJson(
      "/api/v1/readings",
      { readings },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(response.status).toBe(200);
    const answer = (await response.json()) as Answer;
    expect(answer.accepted).toBe(2);
    expect(answer.rejected).toHaveLength(1);
    expect(answer.rejected[0].index).toBe(1);
    expect(answer.rejected[0].reason).toMatch(/^meter: .*NUL/);
    expect(await rawCount(org)).toBe(2);
    const hours = await db
      .select({ intervalStart: schema.intervals.intervalStart })
      .from(schema.intervals)
      .where(eq(schema.intervals.organizationId, org.org.id))
      .orderBy(schema.intervals.intervalStart);
    expect(hours.map((h) => h.intervalStart.toISOString())).toEqual([
      "2026-04-01T08:00:00.000Z",
      "2026-04-01T10:00:00.000Z",
    ]);
  });

  it("an uploaded CSV row with a NUL byte is rejected alone too", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    const manager = await signedIn(org);
    const response = await manager.postJson(
      `/api/v1/orgs/${org.org.id}/readings`,
      {
        readings: [
          water(org, "2026-04-02T08", `\u0000${org.meters.water.code}`),
          water(org, "2026-04-02T09"),
        ],
      },
    );
    expect(response.status).toBe(200);
    expect(await response.json()).toMatchObject({
      accepted: 1,
      rejected: [{ index: 0 }],
    });
    expect(await rawCount(org)).toBe(1);
  });

  it("a NUL byte in a form field answers 400 with the error beside the field", async () => {
    const org = await createMeteredOrg();
    const owner = await signedIn(org);
    const response = await owner.post(`/o/${org.org.id}/gateways`, {
      intent: "create",
      name: "Boiler\u0000room",
    });
    expect(response.status).toBe(400);
    expect(await response.text()).toContain("NUL");
    const [row] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(schema.gateways)
      .where(eq(schema.gateways.organizationId, org.org.id));
    expect(row.n).toBe(1);
  });
});

describe("a malformed Origin header", () => {
  it("answers 403 with a reason, not 500", async () => {
    const response = await new Client().request("/sign-in", {
      method: "POST",
      headers: {
        origin: "x",
        "content-type": "application/x-www-form-urlencoded",
      },
      body: "email=a%40b.example&password=whatever123",
    });
    expect(response.status).toBe(403);
    expect(await response.text()).toMatch(/Origin/);
  });
});

describe("ids that are not UUIDs", () => {
  it("in page URLs answer 404", async () => {
    const org = await createMeteredOrg();
    const owner = await signedIn(org);
    const base = `/o/${org.org.id}`;
    for (const path of [
      "/o/not-a-uuid/overview",
      `${base}/sites/not-a-uuid`,
      `${base}/sites/not-a-uuid/meters/new`,
      `${base}/sites/%00`,
      `${base}/meters/not-a-uuid`,
      `${base}/meters/not-a-uuid/readings`,
      `${base}/reports/not-a-uuid/pdf`,
    ]) {
      const response = await owner.get(path);
      expect([path, response.status]).toEqual([path, 404]);
    }
    const siteForm = await owner.post(`${base}/sites/not-a-uuid`, {
      intent: "save-site",
      name: "Renamed",
      timeZone: "Europe/London",
      floorAreaM2: "",
      degreeDayBaseC: "",
      address: "",
    });
    expect(siteForm.status).toBe(404);
  });

  it("in a form's parentMeterId answer 400 with the error beside the field", async () => {
    const org = await createMeteredOrg();
    const owner = await signedIn(org);
    const meterForm = meterFormFields({
      code: `N-${org.tag}`,
      name: "New meter",
      parentMeterId: "nonsense",
      multiplier: "1",
    });
    const created = await owner.post(
      `/o/${org.org.id}/sites/${org.siteId}/meters/new`,
      meterForm,
    );
    expect(created.status).toBe(400);
    expect(await created.text()).toContain("Choose a parent meter");
    const edited = await owner.post(
      `/o/${org.org.id}/meters/${org.meters.register.id}`,
      { ...meterForm, code: org.meters.register.code },
    );
    expect(edited.status).toBe(400);
    expect(await edited.text()).toContain("Choose a parent meter");
    const [row] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(schema.meters)
      .where(eq(schema.meters.organizationId, org.org.id));
    expect(row.n).toBe(3);
  });

  it("in the weather baseline form's siteId answer 400, not a missing page", async () => {
    const org = await createMeteredOrg();
    const owner = await signedIn(org);
    const response = await owner.post(`/o/${org.org.id}/weather`, {
      intent: "save-baseline",
      siteId: "nonsense",
      carrier: "heat",
      driver: "hdd",
      from: "2025-01",
      to: "2025-12",
    });
    expect(response.status).toBe(400);
    expect(await response.text()).toContain("Choose a site.");
  });
});

describe("corrections follow the time rules of ingest", () => {
  /** Everything an edit writes: the hours, the rollups and the audit log. */
  async function snapshot(org: MeteredOrg) {
    return {
      intervals: await db
        .select()
        .from(schema.intervals)
        .where(eq(schema.intervals.organizationId, org.org.id)),
      rollups: await db
        .select()
        .from(schema.monthlyRollups)
        .where(eq(schema.monthlyRollups.organizationId, org.org.id)),
      audit: await db
        .select()
        .from(schema.auditLog)
        .where(
          and(
            eq(schema.auditLog.organizationId, org.org.id),
            eq(schema.auditLog.action, "interval.edited"),
          ),
        ),
    };
  }

  it("refuses hours outside the meter's life, in the future, in year 0 or off the hour, changing nothing", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    await new Client().postJson(
      "/api/v1/readings",
      { readings: [water(org, "2026-03-11T08")] },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    // Retired at the end of 2026-03-12: hours after that are outside its life.
    await db
      .update(schema.meters)
      .set({ removedAt: new Date("2026-03-13T00:00:00Z") })
      .where(eq(schema.meters.id, org.meters.water.id));
    const manager = await signedIn(org);
    const before = await snapshot(org);
    expect(before.intervals).toHaveLength(1);
    const page = `/o/${org.org.id}/meters/${org.meters.water.id}/readings`;
    const refused: [string, RegExp][] = [
      ["2019-12-31T23:00:00Z", /not installed/],
      ["2026-03-14T08:00:00Z", /not installed/],
      ["2031-01-01T00:00:00Z", /in the future/],
      ["9999-12-31T23:00:00Z", /in the future/],
      ["0000-01-01T00:00:00Z", /before 1990/],
      ["2026-03-11T08:30:00Z", /on the hour/],
    ];
    for (const [intervalStart, message] of refused) {
      const response = await manager.post(page, {
        intent: "edit",
        intervalStart,
        energyKwh: "42",
        reason: "Checked against the site log",
      });
      expect([intervalStart, response.status]).toEqual([intervalStart, 400]);
      expect(await response.text()).toMatch(message);
    }
    expect(await snapshot(org)).toEqual(before);
  });
});
