// Plant on a site: added with a meter per role, judged each month from the
// rollups, a month beyond the laws flagged as a metering fault; every action
// checks the role and no organisation sees another's plant.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { createOrganization, db, pool, schema } from "../support/db";
import { Client, outbox } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

type RunAlerts = typeof import("../../app/alerts/run-alerts.server").runAlerts;
let runAlerts: RunAlerts;
let appPool: { end: () => Promise<void> };

afterAll(async () => {
  await appPool.end();
  await pool.end();
});

let org: MeteredOrg;
let owner: Client;

const plantPath = () => `/o/${org.org.id}/sites/${org.siteId}/plant`;

/** The form as the page posts it for a heat pump on the org's two meters. */
const heatPumpForm = (overrides: Record<string, string> = {}) => ({
  intent: "add-plant",
  name: "Heat pump HP1",
  kind: "heat_pump",
  fuelCvBasis: "gross",
  meter_electricity_in: org.meters.register.id,
  meter_heat_out: org.meters.water.id,
  heatFlowC: "35",
  heatReturnC: "30",
  chilledFlowC: "",
  chilledReturnC: "",
  ...overrides,
});

async function rollup(meterId: string, month: string, energyKwh: string) {
  await db.insert(schema.monthlyRollups).values({
    organizationId: org.org.id,
    meterId,
    month,
    energyKwh,
    estimatedKwh: "0",
    hours: 720,
    estimatedHours: 0,
  });
}

beforeAll(async () => {
  applyAppTestEnv();
  ({ runAlerts } = await import("../../app/alerts/run-alerts.server"));
  ({ pool: appPool } = await import("../../app/db/client.server"));
  org = await createMeteredOrg({ roles: ["owner", "auditor"] });
  owner = new Client();
  await owner.signIn(org.org.members[0].email, org.org.members[0].password);
  // June: 1,000 kWh of electricity gives 3,200 kWh of heat (COP 3.2);
  // July: the heat meter over-reads, 20,000 kWh (COP 20).
  await rollup(org.meters.register.id, "2026-06-01", "1000");
  await rollup(org.meters.water.id, "2026-06-01", "3200");
  await rollup(org.meters.register.id, "2026-07-01", "1000");
  await rollup(org.meters.water.id, "2026-07-01", "20000");
  const days = (month: string) =>
    Array.from({ length: 30 }, (_, i) => ({
      organizationId: org.org.id,
      siteId: org.siteId,
      day: `${month}-${String(i + 1).padStart(2, "0")}`,
      meanTempC: "15",
      source: "seed",
    }));
  await db
    .insert(schema.dailyWeather)
    .values([...days("2026-06"), ...days("2026-07")]);
});

describe("adding plant", () => {
  it("refuses a meter of the wrong carrier for its role, naming both, and stores nothing", async () => {
    const response = await owner.post(
      plantPath(),
      heatPumpForm({ meter_electricity_in: org.meters.water.id }),
    );
    expect(response.status).toBe(400);
    expect(await response.text()).toContain(
      "Electricity in needs a meter of electricity; this one measures heat",
    );
    const stored = await db
      .select()
      .from(schema.plants)
      .where(eq(schema.plants.organizationId, org.org.id));
    expect(stored).toEqual([]);
  });

  it("refuses a heating return warmer than the flow", async () => {
    const response = await owner.post(
      plantPath(),
      heatPumpForm({ heatReturnC: "40" }),
    );
    expect(response.status).toBe(400);
    expect(await response.text()).toContain(
      "return must be cooler than the flow",
    );
  });

  it("refuses another organisation's meter as if it did not exist", async () => {
    const other = await createMeteredOrg();
    const response = await owner.post(
      plantPath(),
      heatPumpForm({ meter_heat_out: other.meters.water.id }),
    );
    expect(response.status).toBe(400);
    expect(await response.text()).toContain("Choose a meter on this site.");
  });

  it("is for managers: an auditor gets 403 and nothing is stored", async () => {
    const auditor = new Client();
    await auditor.signIn(org.org.members[1].email, org.org.members[1].password);
    const response = await auditor.post(plantPath(), heatPumpForm());
    expect(response.status).toBe(403);
    const page = await auditor.get(plantPath());
    expect(page.status).toBe(200);
    expect(await page.text()).not.toContain("Add plant</h2>");
  });

  it("adds a heat pump with its meters and records it in the audit trail", async () => {
    const response = await owner.post(plantPath(), heatPumpForm());
    expect(response.status).toBe(200);
    const [plant] = await db
      .select()
      .from(schema.plants)
      .where(eq(schema.plants.organizationId, org.org.id));
    expect(plant).toMatchObject({ kind: "heat_pump", name: "Heat pump HP1" });
    const links = await db
      .select({
        role: schema.plantMeters.role,
        meterId: schema.plantMeters.meterId,
      })
      .from(schema.plantMeters)
      .where(eq(schema.plantMeters.plantId, plant.id));
    expect(links).toEqual(
      expect.arrayContaining([
        { role: "electricity_in", meterId: org.meters.register.id },
        { role: "heat_out", meterId: org.meters.water.id },
      ]),
    );
    const audit = await db
      .select({ action: schema.auditLog.action })
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.subject, plant.id),
        ),
      );
    expect(audit.map((a) => a.action)).toEqual(["plant.created"]);
  });
});

describe("the plant's months", () => {
  it("shows June's COP within the laws and flags July's as a metering fault", async () => {
    const html = await (await owner.get(plantPath())).text();
    const row = (month: string) => {
      const start = html.indexOf(`data-month="${month}"`);
      return html.slice(start, html.indexOf("</tr>", start));
    };
    expect(row("2026-06")).toContain("3.20");
    expect(row("2026-06")).toContain("Within the laws");
    // Carnot between 15 °C outdoors and water at 35/30 °C: about 17.5.
    expect(row("2026-07")).toContain("20.00");
    expect(row("2026-07")).toMatch(
      /Metering fault: COP 20\.00, above the limit of 17\.\d\d/,
    );
    expect(html).toContain("1 month with a metering fault");
  });

  it("is invisible to another organisation", async () => {
    const stranger = await createOrganization(["owner"]);
    const client = new Client();
    await client.signIn(
      stranger.members[0].email,
      stranger.members[0].password,
    );
    const response = await client.get(plantPath());
    expect([403, 404]).toContain(response.status);
    expect(await response.text()).not.toContain("Heat pump HP1");
  });
});

describe("the alert", () => {
  it("mails the owner once about July's fault, naming the plant's meters", async () => {
    const inAugust = new Date("2026-08-05T06:00:00Z");
    const first = await runAlerts(org.org.id, inAugust);
    const plantAlerts = first.opened.filter((c) => c.kind === "plant_fault");
    expect(plantAlerts).toHaveLength(1);
    expect(plantAlerts[0].title).toContain("Metering fault at Heat pump HP1");
    expect(plantAlerts[0].detail).toContain(org.meters.water.code);
    const mails = (await outbox()).filter(
      (m) =>
        m.to.includes(org.org.members[0].email) &&
        m.text.includes("Metering fault at Heat pump HP1"),
    );
    expect(mails).toHaveLength(1);
    const again = await runAlerts(org.org.id, inAugust);
    expect(again.opened.filter((c) => c.kind === "plant_fault")).toEqual([]);
  });

  it("clears when the heat meter's July is corrected", async () => {
    await db
      .update(schema.monthlyRollups)
      .set({ energyKwh: "3000" })
      .where(
        and(
          eq(schema.monthlyRollups.organizationId, org.org.id),
          eq(schema.monthlyRollups.meterId, org.meters.water.id),
          eq(schema.monthlyRollups.month, "2026-07-01"),
        ),
      );
    const run = await runAlerts(org.org.id, new Date("2026-08-06T06:00:00Z"));
    expect(run.cleared).toBeGreaterThanOrEqual(1);
    const html = await (await owner.get(plantPath())).text();
    expect(html).not.toContain("with a metering fault");
  });
});
