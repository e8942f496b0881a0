import { and, eq } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

async function member(org: MeteredOrg, index: number) {
  const client = new Client();
  await client.signIn(
    org.org.members[index].email,
    org.org.members[index].password,
  );
  return client;
}

const page = (org: MeteredOrg) => `/o/${org.org.id}/weather`;

/** The page's upload form, posted as a browser would: multipart with a file. */
function upload(client: Client, org: MeteredOrg, siteId: string, csv: string) {
  const form = new FormData();
  form.set("intent", "upload-weather");
  form.set("siteId", siteId);
  form.set("file", new Blob([csv], { type: "text/csv" }), "weather.csv");
  return client.request(page(org), { method: "POST", body: form });
}

const csvOf = (rows: [string, number | string][]) =>
  ["date,mean_temp_c", ...rows.map(([d, t]) => `${d},${t}`)].join("\n");

async function storedDays(organizationId: string, siteId: string) {
  return db
    .select()
    .from(schema.dailyWeather)
    .where(
      and(
        eq(schema.dailyWeather.organizationId, organizationId),
        eq(schema.dailyWeather.siteId, siteId),
      ),
    );
}

const day = (month: string, d: number) =>
  `${month}-${String(d).padStart(2, "0")}`;

/** February 2026: the 1st to the 27th alternately 5.5 °C and 10.5 °C, the 28th 18.5 °C. */
const FEBRUARY: [string, number][] = Array.from({ length: 28 }, (_, i) => [
  day("2026-02", i + 1),
  i === 27 ? 18.5 : i % 2 === 0 ? 5.5 : 10.5,
]);

describe("weather upload", () => {
  it("stores nothing when any row is bad: impossible date, non-number, repeated day", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    const manager = await member(org, 0);
    const good: [string, number][] = [
      ["2026-01-01", 3.5],
      ["2026-01-02", 4],
    ];
    const cases: [string, [string, number | string][], RegExp][] = [
      ["bad date", [...good, ["2026-02-30", 2]], /date: use a calendar day/],
      ["non-number", [...good, ["2026-01-03", "mild"]], /must be a number/],
      [
        "repeated day",
        [...good, ["2026-01-02", 5]],
        /2026-01-02 is already on row 3/,
      ],
    ];
    for (const [, rows, message] of cases) {
      const response = await upload(manager, org, org.siteId, csvOf(rows));
      expect(response.status).toBe(400);
      expect(await response.text()).toMatch(message);
    }
    expect(await storedDays(org.org.id, org.siteId)).toHaveLength(0);

    // Too large: refused before it is parsed.
    const big = "date,mean_temp_c\n" + "2026-01-01,1\n".repeat(100_000);
    expect((await upload(manager, org, org.siteId, big)).status).toBe(413);
    expect(await storedDays(org.org.id, org.siteId)).toHaveLength(0);

    const stored = await upload(manager, org, org.siteId, csvOf(good));
    expect(stored.status).toBe(200);
    expect(
      (await storedDays(org.org.id, org.siteId))
        .map((r) => [r.day, r.meanTempC, r.source])
        .sort(),
    ).toEqual([
      ["2026-01-01", "3.50", "upload"],
      ["2026-01-02", "4.00", "upload"],
    ]);
    // Sending a day again replaces it.
    const again = await upload(
      manager,
      org,
      org.siteId,
      csvOf([["2026-01-02", -1.25]]),
    );
    expect(again.status).toBe(200);
    const rows = await storedDays(org.org.id, org.siteId);
    expect(rows.find((r) => r.day === "2026-01-02")?.meanTempC).toBe("-1.25");
    const audit = await db
      .select({ action: schema.auditLog.action })
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.action, "weather.uploaded"),
        ),
      );
    expect(audit).toHaveLength(2);
  });
});

describe("degree days", () => {
  it("a month's HDD and CDD are the sums of its days, as computed by hand", async () => {
    const org = await createMeteredOrg({
      roles: ["energy_manager", "auditor"],
    });
    const manager = await member(org, 0);
    expect(
      (await upload(manager, org, org.siteId, csvOf(FEBRUARY))).status,
    ).toBe(200);
    // By hand, base 15.5 °C (the site's default): 14 days at 5.5 °C give
    // 10 K·d each, 13 days at 10.5 °C give 5 K·d each, and 18.5 °C gives
    // none: HDD = 140 + 65 = 205 K·d. CDD = 18.5 − 15.5 = 3 K·d.
    const auditor = await member(org, 1);
    const response = await auditor.get(
      `${page(org)}?site=${org.siteId}&carrier=heat&baseFrom=2026-01&baseTo=2026-02&reportFrom=2026-02&reportTo=2026-02`,
    );
    expect(response.status).toBe(200);
    const html = await response.text();
    const row = /<tr[^>]*data-month="2026-02"[^>]*>([\s\S]*?)<\/tr>/.exec(
      html,
    )?.[1];
    expect(row).toBeDefined();
    expect(row).toMatch(/data-hdd="205\.00"/);
    expect(row).toMatch(/data-cdd="3\.00"/);
    expect(row).toMatch(/28\/28/);
    // January has no weather at all: listed, with zero days.
    expect(html).toMatch(/data-month="2026-01"[^>]*>[\s\S]*?0\/31/);
  });
});

describe("baselines", () => {
  it("heat that follows the degree days gives R² ≈ 1 and the slope and intercept put in", async () => {
    const org = await createMeteredOrg({
      roles: ["energy_manager", "auditor"],
      timeZone: "UTC",
    });
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
    // Six months of weather, each month a different level.
    const months = [
      ["2025-10", 31, 12],
      ["2025-11", 30, 8],
      ["2025-12", 31, 4],
      ["2026-01", 31, 2],
      ["2026-02", 28, 5],
      ["2026-03", 31, 9],
    ] as const;
    const weather: [string, number][] = [];
    const hdd: number[] = [];
    for (const [month, days, level] of months) {
      let sum = 0;
      for (let d = 1; d <= days; d++) {
        const t = level + ((d % 3) - 1) * 0.5;
        weather.push([day(month, d), t]);
        sum += Math.max(0, 15.5 - t);
      }
      hdd.push(sum);
    }
    const manager = await member(org, 0);
    expect(
      (await upload(manager, org, org.siteId, csvOf(weather))).status,
    ).toBe(200);
    // Register reads at each month start: each month's heat is
    // 200 kWh + 30 kWh/K·d × HDD, a perfect line.
    const starts = [...months.map(([m]) => m), "2026-04"];
    let register = 1000;
    const reads = starts.map((m, i) => {
      if (i > 0) register += 200 + 30 * hdd[i - 1];
      return {
        meter: meter.code,
        quantity: "heat_register",
        time: `${m}-01T00:00:00Z`,
        register_kwh: Math.round(register * 1000) / 1000,
      };
    });
    const posted = await new Client().postJson(
      "/api/v1/readings",
      { readings: reads },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(posted.status).toBe(200);

    const auditor = await member(org, 1);
    const fields = {
      intent: "save-baseline",
      siteId: org.siteId,
      carrier: "heat",
      driver: "hdd",
      from: "2025-10",
      to: "2026-03",
    };
    expect((await auditor.post(page(org), fields)).status).toBe(403);
    const saved = await manager.post(page(org), fields);
    expect(saved.status).toBe(200);
    const [baseline] = await db
      .select()
      .from(schema.baselines)
      .where(eq(schema.baselines.organizationId, org.org.id));
    expect(baseline).toMatchObject({
      siteId: org.siteId,
      carrier: "heat",
      periodFrom: "2025-10-01",
      periodTo: "2026-03-31",
      granularity: "monthly",
      createdByUserId: org.org.members[0].id,
    });
    const model = baseline.model as {
      slope: number;
      intercept: number;
      n: number;
      p: number;
      r2: number;
      cvrmse: number;
      nmbe: number;
      driver: string;
      baseC: number;
      points: { month: string; dd: number; kwh: number }[];
    };
    expect(model.n).toBe(6);
    expect(model.p).toBe(2);
    expect(model.r2).toBeGreaterThan(0.999999);
    expect(model.slope).toBeCloseTo(30, 4);
    expect(model.intercept).toBeCloseTo(200, 1);
    expect(model.cvrmse).toBeLessThan(0.001);
    expect(Math.abs(model.nmbe)).toBeLessThan(1e-6);
    expect(model.driver).toBe("hdd");
    expect(model.baseC).toBe(15.5);
    expect(model.points.map((p) => p.month)).toEqual(months.map(([m]) => m));
    for (const [i, p] of model.points.entries())
      expect(p.dd).toBeCloseTo(hdd[i], 9);

    // The audit trail has the upload and the baseline, with what was fitted.
    const trail = await auditor.get(
      `/api/v1/orgs/${org.org.id}/audit?kind=baseline&site=${org.siteId}`,
    );
    expect(trail.status).toBe(200);
    const { entries } = (await trail.json()) as {
      entries: {
        action: string;
        actor: { id: string };
        site: { id: string };
        changes: { field: string; after: string }[];
      }[];
    };
    expect(entries.map((e) => e.action)).toEqual([
      "baseline.saved",
      "weather.uploaded",
    ]);
    expect(entries[0]).toMatchObject({
      actor: { id: org.org.members[0].id },
      site: { id: org.siteId },
    });
    expect(entries[0].changes).toEqual(
      expect.arrayContaining([
        { field: "From", before: "—", after: "October 2025" },
        { field: "To", before: "—", after: "March 2026" },
        { field: "Slope (kWh per degree day)", before: "—", after: "30" },
        { field: "Months fitted", before: "—", after: "6" },
      ]),
    );
    expect(entries[1].changes).toEqual(
      expect.arrayContaining([
        { field: "Days added", before: "—", after: "182" },
        { field: "From", before: "—", after: "1 Oct 2025" },
      ]),
    );

    // The page shows it to the auditor, without the save button.
    const view = await auditor.get(
      `${page(org)}?site=${org.siteId}&carrier=heat&baseline=${baseline.id}&reportFrom=2026-01&reportTo=2026-03`,
    );
    expect(view.status).toBe(200);
    const html = await view.text();
    expect(html).toContain("In use");
    expect(html).not.toContain("Save baseline</button>");
    expect(html).not.toContain("Upload weather</button>");

    // Six months fit perfectly (both criteria pass) but miss half the year:
    // the model, fitted now or saved, and the saved list carry a warning.
    const shortWarning =
      /Shorter than a year.*Fitted on 6 months, fewer than the 12 of a full year/s;
    expect(html.replace(/<!-- -->/g, "")).toMatch(shortWarning);
    expect(html).toContain("Under a year");
    expect(html).not.toContain(">Fail<");
    const fitted = await manager.get(
      `${page(org)}?site=${org.siteId}&carrier=heat&driver=hdd&baseFrom=2025-10&baseTo=2026-03&reportFrom=2026-01&reportTo=2026-03`,
    );
    expect((await fitted.text()).replace(/<!-- -->/g, "")).toMatch(
      shortWarning,
    );
  });
});

describe("roles and organisations", () => {
  it("an auditor can neither save a baseline nor upload weather", async () => {
    const org = await createMeteredOrg({ roles: ["auditor", "finance"] });
    for (const index of [0, 1]) {
      const client = await member(org, index);
      expect(
        (await upload(client, org, org.siteId, csvOf(FEBRUARY))).status,
      ).toBe(403);
      expect(
        (
          await client.post(page(org), {
            intent: "save-baseline",
            siteId: org.siteId,
            carrier: "heat",
            driver: "hdd",
            from: "2026-01",
            to: "2026-02",
          })
        ).status,
      ).toBe(403);
      // Viewing is allowed.
      expect((await client.get(page(org))).status).toBe(200);
    }
    expect(await storedDays(org.org.id, org.siteId)).toHaveLength(0);
    expect(
      await db
        .select()
        .from(schema.baselines)
        .where(eq(schema.baselines.organizationId, org.org.id)),
    ).toHaveLength(0);
  });

  it("another organisation's site is not found, and nothing is written to it", async () => {
    const mine = await createMeteredOrg({ roles: ["energy_manager"] });
    const theirs = await createMeteredOrg({ roles: ["energy_manager"] });
    const manager = await member(mine, 0);
    expect(
      (await manager.get(`${page(mine)}?site=${theirs.siteId}`)).status,
    ).toBe(404);
    expect((await manager.get(`${page(mine)}?site=not-a-site`)).status).toBe(
      404,
    );
    expect(
      (await upload(manager, mine, theirs.siteId, csvOf(FEBRUARY))).status,
    ).toBe(404);
    expect(
      (
        await manager.post(page(mine), {
          intent: "save-baseline",
          siteId: theirs.siteId,
          carrier: "heat",
          driver: "hdd",
          from: "2026-01",
          to: "2026-02",
        })
      ).status,
    ).toBe(404);
    // Their page itself is not found either.
    expect((await manager.get(page(theirs))).status).toBe(404);
    expect(await storedDays(theirs.org.id, theirs.siteId)).toHaveLength(0);
    expect(await storedDays(mine.org.id, theirs.siteId)).toHaveLength(0);
  });
});
