import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

describe("Overview", () => {
  it("lists meters silent beyond the threshold and keeps to its organisation", async () => {
    const org = await createMeteredOrg({ roles: ["auditor"] });
    const hourAgo = (h: number) =>
      new Date(
        Math.floor(Date.now() / 3_600_000) * 3_600_000 - h * 3_600_000,
      ).toISOString();
    // The register reported until 30 hours ago; the export meter until 2 hours ago.
    const reads = [
      {
        meter: org.meters.register.code,
        quantity: "electric_register",
        time: hourAgo(31),
        register_kwh: 10,
      },
      {
        meter: org.meters.register.code,
        quantity: "electric_register",
        time: hourAgo(30),
        register_kwh: 12,
      },
      {
        meter: org.meters.export.code,
        quantity: "electric_register",
        time: hourAgo(3),
        register_kwh: 10,
      },
      {
        meter: org.meters.export.code,
        quantity: "electric_register",
        time: hourAgo(2),
        register_kwh: 11,
      },
    ];
    const posted = await new Client().postJson(
      "/api/v1/readings",
      { readings: reads },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(posted.status).toBe(200);
    const auditor = new Client();
    await auditor.signIn(org.org.members[0].email, org.org.members[0].password);
    const page = await (
      await auditor.get(`/o/${org.org.id}/overview?silent=24`)
    ).text();
    const silentSection = page.slice(page.indexOf("Silent meters"));
    expect(silentSection).toContain(org.meters.register.code);
    expect(silentSection).toContain(org.meters.water.code); // never reported
    expect(silentSection).not.toContain(org.meters.export.code);
    const longer = await (
      await auditor.get(`/o/${org.org.id}/overview?silent=48`)
    ).text();
    expect(longer.slice(longer.indexOf("Silent meters"))).not.toContain(
      org.meters.register.code,
    );

    const stranger = await createMeteredOrg({ roles: ["owner"] });
    const outsider = new Client();
    await outsider.signIn(
      stranger.org.members[0].email,
      stranger.org.members[0].password,
    );
    expect((await outsider.get(`/o/${org.org.id}/overview`)).status).toBe(404);
  });
});
