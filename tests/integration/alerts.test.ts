import { eq } from "drizzle-orm";
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

const mailsTo = async (email: string) =>
  (await outbox()).filter((m) => m.to.includes(email));

/** Messages to `email` that mention `text` (alerts come as digests). */
const mailsAbout = async (email: string, text: string) =>
  (await mailsTo(email)).filter(
    (m) => m.subject.includes(text) || m.text.includes(text),
  );

describe("alert e-mails", () => {
  it("mails a meter that sends no data once, not again while it stays quiet, and again after it clears and recurs", async () => {
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
      await mailsAbout(manager.email, `No data from meter ${code}`),
    ).toHaveLength(1);
    // Auditors are not mailed unless they ask.
    expect(await mailsAbout(auditor.email, "No data from meter")).toHaveLength(
      0,
    );

    await runAlerts(org.org.id);
    expect(
      await mailsAbout(manager.email, `No data from meter ${code}`),
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
      await mailsAbout(manager.email, `No data from meter ${code}`),
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
    expect(await mailsAbout(owner.email, "No data from meter")).toHaveLength(0);
    expect(
      (await mailsAbout(auditor.email, "No data from meter")).length,
    ).toBeGreaterThan(0);
  });
});

/** A second site with `count` meters that never reported, in the same organisation. */
async function addSilentSite(org: MeteredOrg, name: string, count: number) {
  const [site] = await db
    .insert(schema.sites)
    .values({ organizationId: org.org.id, name, timeZone: "Europe/London" })
    .returning({ id: schema.sites.id });
  const codes = Array.from({ length: count }, (_, i) => `S${i}-${org.tag}`);
  await db.insert(schema.meters).values(
    codes.map((code) => ({
      organizationId: org.org.id,
      siteId: site.id,
      code,
      name: `Sub-meter ${code}`,
      quantity: "electric_register" as const,
      carrier: "electricity" as const,
      orientation: "import" as const,
      installedAt: new Date("2020-01-01T00:00:00Z"),
    })),
  );
  return codes;
}

/** Two register reads an hour apart on the first day of last month. */
function lastMonthReads(code: string) {
  const now = new Date();
  const first = Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 2);
  return [0, 1].map((h) => ({
    meter: code,
    quantity: "electric_register",
    time: new Date(first + h * 3_600_000).toISOString(),
    register_kwh: 10 + h,
  }));
}

describe("alert digests", () => {
  it("a run with many conditions sends one message per person, listing them all by site", async () => {
    const org = await createMeteredOrg({
      roles: ["owner", "energy_manager", "auditor"],
    });
    const [owner, manager, auditor] = org.org.members;
    const siteName = (
      await db
        .select({ name: schema.sites.name })
        .from(schema.sites)
        .where(eq(schema.sites.id, org.siteId))
    )[0].name;
    // "Annexe" sorts before "Test site …": the digest lists sites by name.
    const annexe = await addSilentSite(org, `Annexe ${org.tag}`, 4);
    // Last month has data and is not closed: "ready to close", for the
    // whole organisation.
    await post(org, lastMonthReads(org.meters.register.code));

    const run = await runAlerts(org.org.id);
    const silent = run.opened.filter((c) => c.kind === "silent_meter");
    // The four annexe meters and the three on the first site.
    expect(silent).toHaveLength(7);
    expect(run.opened.map((c) => c.kind)).toContain("month_ready");
    expect(run.emails).toBe(2);

    for (const person of [owner, manager]) {
      const mails = await mailsTo(person.email);
      expect(mails, person.email).toHaveLength(1);
      const [digest] = mails;
      expect(digest.subject).toBe(
        `Joulebook: ${run.opened.length} new alerts for ${org.org.name}`,
      );
      const text = digest.text;
      for (const c of run.opened)
        expect(text.split(c.title).length - 1, c.title).toBe(1);
      // By site: the annexe's meters under its heading, then the first
      // site's, then what concerns the whole organisation.
      const at = (needle: string) => text.indexOf(needle);
      const annexeAt = at(`\nAnnexe ${org.tag}\n`);
      const siteAt = at(`\n${siteName}\n`);
      const wholeAt = at("\nWhole organisation\n");
      expect(annexeAt).toBeGreaterThan(0);
      expect(siteAt).toBeGreaterThan(annexeAt);
      expect(wholeAt).toBeGreaterThan(siteAt);
      for (const code of annexe) {
        expect(at(`No data from meter ${code}`)).toBeGreaterThan(annexeAt);
        expect(at(`No data from meter ${code}`)).toBeLessThan(siteAt);
      }
      for (const meter of Object.values(org.meters)) {
        expect(at(`No data from meter ${meter.code}`)).toBeGreaterThan(siteAt);
        expect(at(`No data from meter ${meter.code}`)).toBeLessThan(wholeAt);
      }
      expect(at("is ready to close")).toBeGreaterThan(wholeAt);
    }
    expect(await mailsTo(auditor.email)).toHaveLength(0);

    // The open alerts stay single: a second run opens and sends nothing.
    const again = await runAlerts(org.org.id);
    expect(again.opened).toEqual([]);
    expect(again.emails).toBe(0);
    expect(await mailsTo(owner.email)).toHaveLength(1);
  });

  it("someone in two organisations gets one digest per run, by organisation", async () => {
    const first = await createMeteredOrg({ roles: ["energy_manager"] });
    const second = await createMeteredOrg({ roles: ["owner"] });
    const [person] = first.org.members;
    await db.insert(schema.memberships).values({
      organizationId: second.org.id,
      userId: person.id,
      role: "energy_manager",
    });
    const { runAllAlerts } = await import("../../app/alerts/run-alerts.server");
    await runAllAlerts();
    const mails = await mailsTo(person.email);
    expect(mails).toHaveLength(1);
    expect(mails[0].subject).toMatch(/new alerts in 2 organisations$/);
    for (const org of [first, second]) {
      expect(mails[0].text).toContain(`== ${org.org.name} ==`);
      expect(mails[0].text).toContain(
        `No data from meter ${org.meters.water.code}`,
      );
    }
    // The other owner gets only their own organisation's.
    const [otherOwner] = second.org.members;
    const theirs = await mailsTo(otherOwner.email);
    expect(theirs).toHaveLength(1);
    expect(theirs[0].text).not.toContain(first.org.name);
  });
});
