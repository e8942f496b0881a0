// The demo estate's plant, as seeded: the depot's gas boiler house, the
// sheltered housing's heat pump and the pool's hydrogen fuel cell show
// plausible monthly figures, and the one planted fault (the boiler house
// heat meter over-reading in February 2026) is flagged, on the Plant page
// and in a signed report's data.
import { randomBytes } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { gatewayKeyPrefix } from "../../app/auth/gateway-keys.server";
import { hashToken } from "../../app/auth/tokens.server";
import { MAX_READINGS_PER_BATCH } from "../../app/ingest/reading-schema";
import { generateReadings } from "../../seeds/scenario/generate";
import {
  BOILER_FAULT,
  PLANTS,
  SITE,
} from "../../seeds/scenario/larchmere-estate";
import { applyAppTestEnv } from "../support/app-env";
import { createOrganization, db, pool, schema } from "../support/db";
import { Client } from "../support/http";
import { estimationSettled } from "../support/estimation";

/** The months around the planted fault: January and February 2026 (UTC = London in winter). */
const RANGE = {
  from: new Date("2026-01-01T00:00:00Z"),
  to: new Date("2026-03-01T00:00:00Z"),
};
const PLANT_METERS = new Set(PLANTS.flatMap((p) => Object.values(p.meters)));

let appPool: { end(): Promise<void> } | null = null;
afterAll(async () => {
  await pool.end();
  await appPool?.end();
});

let org: Awaited<ReturnType<typeof createOrganization>>;
let owner: Client;

async function postPlantReadings(gatewayKey: string) {
  const readings = [...generateReadings(RANGE)]
    .filter(({ meter }) => PLANT_METERS.has(meter))
    .map(({ reading }) => reading);
  for (let i = 0; i < readings.length; i += MAX_READINGS_PER_BATCH) {
    const response = await new Client().postJson(
      "/api/v1/readings",
      { readings: readings.slice(i, i + MAX_READINGS_PER_BATCH) },
      { authorization: `Bearer ${gatewayKey}` },
    );
    const body = (await response.json()) as { rejected: unknown[] };
    expect(response.status).toBe(200);
    expect(body.rejected).toEqual([]);
  }
}

// The demo estate's sites, meters and plant exactly as the seed makes them,
// in a fresh organisation, with the scenario's plant readings for the two
// months and its weather.
beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  applyAppTestEnv();
  const [{ createEstate }, { seedWeather }, client] = await Promise.all([
    import("../../seeds/seed-estate"),
    import("../../seeds/seed-weather"),
    import("../../app/db/client.server"),
  ]);
  appPool = client.pool;
  org = await createOrganization(["owner"]);
  expect(await createEstate(org.id)).toBe(true);
  await seedWeather(org.id);
  const gatewayKey = `jbgw_${randomBytes(32).toString("base64url")}`;
  await db.insert(schema.gateways).values({
    organizationId: org.id,
    name: "Demo plant gateway",
    keyHash: hashToken(gatewayKey),
    keyPrefix: gatewayKeyPrefix(gatewayKey),
  });
  await postPlantReadings(gatewayKey);
  await estimationSettled(org.id);
  owner = new Client();
  await owner.signIn(org.members[0].email, org.members[0].password);
}, 120_000);

async function plantPage(siteName: string): Promise<string> {
  const [site] = await db
    .select({ id: schema.sites.id })
    .from(schema.sites)
    .where(
      and(
        eq(schema.sites.organizationId, org.id),
        eq(schema.sites.name, siteName),
      ),
    );
  const response = await owner.get(`/o/${org.id}/sites/${site.id}/plant`);
  expect(response.status).toBe(200);
  return response.text();
}

/** Each month row of the page's table: its month and its cells' text. */
function monthRows(html: string) {
  const rows: { month: string; cells: string[] }[] = [];
  for (const m of html.matchAll(
    /<tr[^>]*data-month="(\d{4}-\d{2})"[^>]*>(.*?)<\/tr>/gs,
  )) {
    const cells = [...m[2].matchAll(/<td[^>]*>(.*?)<\/td>/gs)].map((c) =>
      c[1].replace(/<!-- -->/g, "").replace(/<[^>]+>/g, ""),
    );
    rows.push({ month: m[1], cells });
  }
  return rows;
}

const percent = (text: string) => Number(text.replace(/[^\d.]/g, ""));

describe("the demo's plant", () => {
  it("flags the boiler house's planted month above 100 % and passes the others at 80–92 % gross", async () => {
    const rows = monthRows(await plantPage(SITE.depot));
    expect(rows.map((r) => r.month)).toEqual(["2026-02", "2026-01"]);
    for (const row of rows) {
      const efficiency = percent(row.cells[3]);
      if (row.month === BOILER_FAULT.month) {
        expect(efficiency).toBeGreaterThan(100);
        expect(row.cells.at(-1)).toContain("Metering fault");
      } else {
        expect(efficiency, row.month).toBeGreaterThan(80);
        expect(efficiency, row.month).toBeLessThan(92);
        expect(row.cells.at(-1), row.month).toBe("Within the laws");
      }
    }
  });

  it("prices the school's hcf gas register with its supply's CVs: its boiler house runs at 80–90 % gross", async () => {
    // The register's reads carry no CV: each hour took its day's from the
    // series the seed entered (seeds/scenario/gas-supplies.ts).
    const rows = monthRows(await plantPage(SITE.school));
    expect(rows.map((r) => r.month)).toEqual(["2026-02", "2026-01"]);
    for (const row of rows) {
      const efficiency = percent(row.cells[3]);
      expect(efficiency, row.month).toBeGreaterThan(80);
      expect(efficiency, row.month).toBeLessThan(90);
      expect(row.cells.at(-1), row.month).toBe("Within the laws");
    }
  });

  it("shows the heat pump's COP between 2 and 4.5, within the Carnot limit every month", async () => {
    const rows = monthRows(await plantPage(SITE.housing));
    expect(rows.map((r) => r.month)).toEqual(["2026-02", "2026-01"]);
    for (const row of rows) {
      const cop = Number(row.cells[3]);
      expect(cop, row.month).toBeGreaterThan(2);
      expect(cop, row.month).toBeLessThan(4.5);
      expect(row.cells.at(-1), row.month).toBe("Within the laws");
    }
  });

  it("shows the fuel cell near 45 % electrical on the gross basis, below hydrogen's 83.0 % limit", async () => {
    const rows = monthRows(await plantPage(SITE.pool));
    expect(rows.map((r) => r.month)).toEqual(["2026-02", "2026-01"]);
    for (const row of rows) {
      const electrical = percent(row.cells[4]);
      expect(electrical, row.month).toBeGreaterThan(40);
      expect(electrical, row.month).toBeLessThan(50);
      expect(row.cells.at(-1), row.month).toBe("Within the laws");
    }
  });

  it("keeps the plant's output meters out of delivered energy: gas, hydrogen and the heat pump's electricity only", async () => {
    const response = await owner.get(
      `/api/v1/orgs/${org.id}/ledger?from=2026-02&to=2026-02`,
    );
    expect(response.status).toBe(200);
    const body = (await response.json()) as {
      rows: { site_name: string; carrier: string }[];
    };
    const carriersAt = (site: string) =>
      body.rows
        .filter((r) => r.site_name === site)
        .map((r) => r.carrier)
        .sort();
    expect(carriersAt(SITE.depot)).toEqual(["natural_gas"]);
    expect(carriersAt(SITE.housing)).toEqual(["electricity"]);
    expect(carriersAt(SITE.pool)).toEqual(["hydrogen"]);
  });
});
