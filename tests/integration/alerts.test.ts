import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { Client, outbox } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

type RunAlerts = typeof import("../../app/alerts/run-alerts.server").runAlerts;
let runAlerts: RunAlerts;
let appPool: { end: () => Promise<void> };

// The check runs in this process against the test database; its e-mails go
// to the same local e-mail service as the server's.
beforeAll(async () => {
  applyAppTestEnv();
  ({ runAlerts } = await import("../../app/alerts/run-alerts.server"));
  ({ pool: appPool } = await import("../../app/db/client.server"));
  await db.delete(schema.signInAttempts);
});
afterAll(async () => {
  await appPool.end();
  await pool.end();
});

const hourAgo = (h: number) =>
  new Date(
    Math.floor(Date.now() / 3_600_000) * 3_600_000 - h * 3_600_000,
  ).toISOString();

async function post(org: MeteredOrg, readings: unknown[]) {
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(response.status).toBe(200);
}

const mailsAbout = async (email: string, text: string) =>
  (await outbox()).filter(
    (m) => m.to.includes(email) && m.subject.includes(text),
  );

describe("alert e-mails", () => {
  it("mails a silent meter once, not again while it stays silent, and again after it clears and recurs", async () => {
    const org = await createMeteredOrg({
      roles: ["energy_manager", "auditor"],
    });
    const [manager, auditor] = org.org.members;
    const code = org.meters.register.code;
    await post(org, [
      {
        meter: code,
        quantity: "electric_register",
        time: hourAgo(31),
        register_kwh: 1,
      },
      {
        meter: code,
        quantity: "electric_register",
        time: hourAgo(30),
        register_kwh: 2,
      },
    ]);
    const first = await runAlerts(org.org.id);
    expect(first.opened.map((c) => c.kind)).toContain("silent_meter");
    expect(
      await mailsAbout(manager.email, `Meter ${code} has been silent`),
    ).toHaveLength(1);
    // Auditors are not mailed unless they ask.
    expect(await mailsAbout(auditor.email, "silent")).toHaveLength(0);

    await runAlerts(org.org.id);
    expect(
      await mailsAbout(manager.email, `Meter ${code} has been silent`),
    ).toHaveLength(1);

    // It reports again: the alert clears; silence later alerts again.
    await post(org, [
      {
        meter: code,
        quantity: "electric_register",
        time: hourAgo(1),
        register_kwh: 30,
      },
      {
        meter: code,
        quantity: "electric_register",
        time: hourAgo(0),
        register_kwh: 31,
      },
    ]);
    const cleared = await runAlerts(org.org.id);
    expect(cleared.cleared).toBeGreaterThanOrEqual(1);
    const later = new Date(Date.now() + 40 * 3_600_000);
    await runAlerts(org.org.id, later);
    expect(
      await mailsAbout(manager.email, `Meter ${code} has been silent`),
    ).toHaveLength(2);
  });

  it("each person's settings choose what they get", async () => {
    const org = await createMeteredOrg({ roles: ["owner", "auditor"] });
    const [owner, auditor] = org.org.members;
    const ownerClient = new Client();
    await ownerClient.signIn(owner.email, owner.password);
    const bad = await ownerClient.post(`/o/${org.org.id}/overview`, {
      intent: "alerts",
      silentHours: "soon",
    });
    expect(bad.status).toBe(400);
    expect(
      (
        await ownerClient.post(`/o/${org.org.id}/overview`, {
          intent: "alerts",
          residual: "on",
          monthReady: "on",
          silentHours: "24",
        })
      ).status,
    ).toBe(200);
    const auditorClient = new Client();
    await auditorClient.signIn(auditor.email, auditor.password);
    expect(
      (
        await auditorClient.post(`/o/${org.org.id}/overview`, {
          intent: "alerts",
          silentMeter: "on",
          silentHours: "12",
        })
      ).status,
    ).toBe(200);
    await runAlerts(org.org.id);
    expect(await mailsAbout(owner.email, "has been silent")).toHaveLength(0);
    expect(
      (await mailsAbout(auditor.email, "has been silent")).length,
    ).toBeGreaterThan(0);
  });
});
