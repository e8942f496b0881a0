import { desc, eq } from "drizzle-orm";
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
    const silentSection = page.slice(page.indexOf("Meters with no data"));
    expect(silentSection).toContain(org.meters.register.code);
    expect(silentSection).toContain(org.meters.water.code); // never reported
    expect(silentSection).not.toContain(org.meters.export.code);
    const longer = await (
      await auditor.get(`/o/${org.org.id}/overview?silent=48`)
    ).text();
    expect(longer.slice(longer.indexOf("Meters with no data"))).not.toContain(
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

  it("shows last month's metered energy beside what the newest saved baseline predicts for its degree days", async () => {
    const org = await createMeteredOrg({
      roles: ["energy_manager"],
      timeZone: "UTC",
    });
    const manager = new Client();
    await manager.signIn(org.org.members[0].email, org.org.members[0].password);
    const overview = `/o/${org.org.id}/overview`;
    const section = (html: string) =>
      html.slice(html.indexOf("Against baseline"), html.indexOf("Your alert"));

    // Nothing saved yet: a pointer to the Weather & baselines page.
    const empty = section(await (await manager.get(overview)).text());
    expect(empty).toContain("No baseline saved yet");
    expect(empty).toContain(`href="/o/${org.org.id}/weather"`);

    const [meter] = await db
      .insert(schema.meters)
      .values({
        organizationId: org.org.id,
        siteId: org.siteId,
        code: `H-${org.tag}`,
        name: "Heat register",
        quantity: "heat_register",
        carrier: "heat",
        orientation: "import",
        installedAt: new Date("2020-01-01T00:00:00Z"),
      })
      .returning();

    // The last full month (the Overview's), and six months before it for
    // the baseline, each colder or milder by its own level.
    const now = new Date();
    const monthAt = (back: number) =>
      new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - back, 1))
        .toISOString()
        .slice(0, 7);
    const months = [7, 6, 5, 4, 3, 2, 1].map(monthAt);
    const levels = [12, 8, 4, 2, 5, 9, 6];
    const weather: string[] = ["date,mean_temp_c"];
    const hdd = months.map((month, i) => {
      const [y, m] = month.split("-").map(Number);
      const days = new Date(Date.UTC(y, m, 0)).getUTCDate();
      let sum = 0;
      for (let d = 1; d <= days; d++) {
        const t = levels[i] + ((d % 3) - 1) * 0.5;
        weather.push(`${month}-${String(d).padStart(2, "0")},${t}`);
        sum += Math.max(0, 15.5 - t);
      }
      return sum;
    });
    const form = new FormData();
    form.set("intent", "upload-weather");
    form.set("siteId", org.siteId);
    form.set(
      "file",
      new Blob([weather.join("\n")], { type: "text/csv" }),
      "weather.csv",
    );
    expect(
      (
        await manager.request(`/o/${org.org.id}/weather`, {
          method: "POST",
          body: form,
        })
      ).status,
    ).toBe(200);

    // Baseline months use 200 kWh + 30 kWh/K·d × HDD; the last month a
    // fifth more than that, so it shows well beyond ±10 %.
    const energy = hdd.map(
      (dd, i) => (200 + 30 * dd) * (i === months.length - 1 ? 1.2 : 1),
    );
    let register = 1000;
    const reads = [...months, monthAt(0)].map((month, i) => {
      if (i > 0) register += energy[i - 1];
      return {
        meter: meter.code,
        quantity: "heat_register",
        time: `${month}-01T00:00:00Z`,
        register_kwh: Math.round(register * 1000) / 1000,
      };
    });
    const posted = await new Client().postJson(
      "/api/v1/readings",
      { readings: reads },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(posted.status).toBe(200);
    expect(((await posted.json()) as { accepted: number }).accepted).toBe(
      reads.length,
    );

    const saved = await manager.post(`/o/${org.org.id}/weather`, {
      intent: "save-baseline",
      siteId: org.siteId,
      carrier: "heat",
      driver: "hdd",
      from: months[0],
      to: months[5],
    });
    expect(saved.status).toBe(200);
    const [baseline] = await db
      .select()
      .from(schema.baselines)
      .where(eq(schema.baselines.organizationId, org.org.id));
    const model = baseline.model as { slope: number; intercept: number };
    const last = months.length - 1;
    const expected = model.intercept + model.slope * hdd[last];
    const actual = energy[last];
    expect(expected).toBeCloseTo(200 + 30 * hdd[last], 1);

    const html = section(await (await manager.get(overview)).text());
    expect(html).not.toContain("No baseline saved yet");
    expect(html).toContain(months[last]);
    const row = new RegExp(
      `<tr[^>]*data-site="${org.siteId}"[^>]*data-carrier="heat"[^>]*>([\\s\\S]*?)</tr>`,
    ).exec(html);
    expect(row).not.toBeNull();
    const attribute = (name: string) =>
      Number(new RegExp(`data-${name}="([^"]+)"`).exec(row![0])?.[1]);
    expect(attribute("actual-kwh")).toBeCloseTo(actual, 2);
    expect(attribute("expected-kwh")).toBeCloseTo(expected, 2);
    const shown = (x: number) =>
      `${x.toLocaleString("en-GB", { maximumFractionDigits: 0 })} kWh`;
    // HDD here are whole halves, so both figures lie within a hair of a
    // whole kWh and show as that.
    expect(row![1]).toContain(shown(Math.round(actual)));
    expect(row![1]).toContain(shown(Math.round(expected)));
    // (actual − expected) / expected ≈ +20 %: more than expected, so an
    // up pill, solid beyond the ±10 % tolerance, its arrow saying so too.
    const difference = (100 * (actual - expected)) / expected;
    expect(difference).toBeCloseTo(20, 2);
    expect(row![1]).toContain(`+${difference.toFixed(1)} %`);
    expect(row![1]).toMatch(
      /data-direction="up"[^>]*bg-danger-700[^>]*>.*▲.*\+20\.0 %/,
    );
    // Six months fitted: the page's and the reports' caution, here too.
    expect(row![1].replace(/<!-- -->/g, "")).toContain(
      "Fitted on 6 months only: treat with caution",
    );

    // A newer baseline of the same site and carrier takes over: still one row.
    expect(
      (
        await manager.post(`/o/${org.org.id}/weather`, {
          intent: "save-baseline",
          siteId: org.siteId,
          carrier: "heat",
          driver: "hdd",
          from: months[2],
          to: months[5],
        })
      ).status,
    ).toBe(200);
    const [newest] = await db
      .select({ id: schema.baselines.id })
      .from(schema.baselines)
      .where(eq(schema.baselines.organizationId, org.org.id))
      .orderBy(desc(schema.baselines.createdAt))
      .limit(1);
    expect(newest.id).not.toBe(baseline.id);
    const again = section(await (await manager.get(overview)).text());
    expect(again.match(/<tr[^>]*data-site=/g)).toHaveLength(1);
    expect(again).toContain(`baseline=${newest.id}`);
    expect(again).not.toContain(`baseline=${baseline.id}`);
    expect(again.replace(/<!-- -->/g, "")).toContain("Fitted on 4 months only");
  });
});
