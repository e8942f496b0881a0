/**
 * Fuels on the boundary and meters inside it (issue #15): an energy manager
 * adds a gas supply and an oil tank over the JSON API, a gateway sends their
 * readings, and the boiler house's heat meter is moved inside the boundary,
 * so the ledger counts the gas once and the plant page sets the heat against
 * it. Role and tenancy rules stay as they were.
 */
import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { createOrganization, db, pool, schema } from "../support/db";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

type EstateOverview =
  typeof import("../../app/overview/overview-page.server").estateOverview;
let estateOverview: EstateOverview;
let appPool: { end: () => Promise<void> };

type Json = Record<string, unknown>;
type Answer = {
  accepted: number;
  rejected: { index: number; reason: string }[];
};
type LedgerAnswer = {
  rows: { month: string; carrier: string; imports_kwh: string }[];
};

let org: MeteredOrg;
let manager: Client;
let auditor: Client;
let base: string;
let gasMeterId: string;
let oilMeterId: string;

afterAll(async () => {
  await appPool.end();
  await pool.end();
});

function patchJson(client: Client, path: string, body: unknown) {
  return client.request(path, {
    method: "PATCH",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
}

async function signedIn(index: number) {
  const client = new Client();
  await client.signIn(
    org.org.members[index].email,
    org.org.members[index].password,
  );
  return client;
}

async function postReadings(readings: unknown[]): Promise<Answer> {
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(response.status).toBe(200);
  return (await response.json()) as Answer;
}

async function rawReadings(meterId: string) {
  return db
    .select({ energyKwh: schema.rawReadings.energyKwh })
    .from(schema.rawReadings)
    .where(
      and(
        eq(schema.rawReadings.organizationId, org.org.id),
        eq(schema.rawReadings.meterId, meterId),
      ),
    );
}

async function ledgerRows(month: string) {
  const response = await auditor.get(
    `${base}/ledger?from=${month}&to=${month}`,
  );
  expect(response.status).toBe(200);
  return ((await response.json()) as LedgerAnswer).rows;
}

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

const fuelMeter = (code: string, fields: Json) => ({
  site_id: org.siteId,
  code,
  name: `Fuel ${code}`,
  orientation: "import",
  installed_at: "2020-01-01",
  ...fields,
});

beforeAll(async () => {
  applyAppTestEnv();
  ({ estateOverview } =
    await import("../../app/overview/overview-page.server"));
  ({ pool: appPool } = await import("../../app/db/client.server"));
  org = await createMeteredOrg({ roles: ["energy_manager", "auditor"] });
  manager = await signedIn(0);
  auditor = await signedIn(1);
  base = `/api/v1/orgs/${org.org.id}`;
});

describe("fuel meters", () => {
  it("a natural gas supply is a gas_volume meter on the boundary", async () => {
    const created = await manager.postJson(
      `${base}/meters`,
      fuelMeter(`G-${org.tag}`, {
        quantity: "gas_volume",
        carrier: "natural_gas",
      }),
    );
    expect(created.status).toBe(201);
    const meter = (await created.json()) as Json;
    expect(meter).toMatchObject({
      quantity: "gas_volume",
      carrier: "natural_gas",
      position: "boundary",
    });
    gasMeterId = meter.id as string;
  });

  it("refuses a fuel meter that exports, or a carrier its quantity cannot measure, storing nothing", async () => {
    const exporting = await manager.postJson(
      `${base}/meters`,
      fuelMeter(`G2-${org.tag}`, {
        quantity: "gas_volume",
        carrier: "natural_gas",
        orientation: "export",
      }),
    );
    expect(exporting.status).toBe(400);
    expect(await exporting.text()).toContain("A fuel meter imports");
    const oilByVolume = await manager.postJson(
      `${base}/meters`,
      fuelMeter(`G3-${org.tag}`, {
        quantity: "gas_volume",
        carrier: "gas_oil",
      }),
    );
    expect(oilByVolume.status).toBe(400);
    expect(await oilByVolume.text()).toContain(
      "A gas volume meter accounts for natural gas.",
    );
    const [{ n }] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(schema.meters)
      .where(
        and(
          eq(schema.meters.organizationId, org.org.id),
          sql`${schema.meters.code} in (${`G2-${org.tag}`}, ${`G3-${org.tag}`})`,
        ),
      );
    expect(n).toBe(0);
  });

  it("stores a gas reading's energy as V × correction × CV / 3.6 and the ledger lists it as natural gas", async () => {
    const answer = await postReadings([
      {
        meter: `G-${org.tag}`,
        quantity: "gas_volume",
        start: "2026-06-10T00:00:00Z",
        end: "2026-06-10T01:00:00Z",
        volume_m3: 100,
        correction_factor: 1.02,
        calorific_value_mj_m3: 39.5,
      },
    ]);
    expect(answer).toMatchObject({ accepted: 1, rejected: [] });
    // 100 m³ × 1.02 × 39.5 MJ/m³ = 4,029 MJ; ÷ 3.6 MJ/kWh = 1,119.1667 kWh.
    expect(await rawReadings(gasMeterId)).toEqual([
      { energyKwh: "1119.166667" },
    ]);
    await expect
      .poll(async () =>
        (await ledgerRows("2026-06")).find((r) => r.carrier === "natural_gas"),
      )
      .toMatchObject({ imports_kwh: "1119.166667" });
  });

  it("refuses an oil tank's reading whose stock consumption is negative, naming the fields, and stores nothing", async () => {
    const created = await manager.postJson(
      `${base}/meters`,
      fuelMeter(`O-${org.tag}`, {
        quantity: "liquid_fuel",
        carrier: "gas_oil",
      }),
    );
    expect(created.status).toBe(201);
    oilMeterId = ((await created.json()) as Json).id as string;
    const answer = await postReadings([
      {
        meter: `O-${org.tag}`,
        quantity: "liquid_fuel",
        start: "2026-06-01T00:00:00Z",
        end: "2026-06-02T00:00:00Z",
        opening_stock_l: 1000,
        deliveries_l: 0,
        closing_stock_l: 1500,
        density_kg_l: 0.845,
        calorific_value_mj_kg: 45.6,
      },
    ]);
    expect(answer.accepted).toBe(0);
    expect(answer.rejected[0].reason).toContain(
      "opening_stock_l + deliveries_l − closing_stock_l = -500 l is negative",
    );
    expect(await rawReadings(oilMeterId)).toEqual([]);
  });
});

describe("a heat meter inside the boundary", () => {
  beforeAll(async () => {
    // September: 10,000 kWh of gas makes 8,800 kWh of heat (88 % gross);
    // October: the heat meter over-reads, 10,500 kWh (105 %).
    await rollup(gasMeterId, "2026-09-01", "10000");
    await rollup(org.meters.water.id, "2026-09-01", "8800");
    await rollup(gasMeterId, "2026-10-01", "10000");
    await rollup(org.meters.water.id, "2026-10-01", "10500");
    const days = (month: string) =>
      Array.from({ length: 30 }, (_, i) => ({
        organizationId: org.org.id,
        siteId: org.siteId,
        day: `${month}-${String(i + 1).padStart(2, "0")}`,
        meanTempC: "12",
        source: "seed",
      }));
    await db
      .insert(schema.dailyWeather)
      .values([...days("2026-09"), ...days("2026-10")]);
  });

  it("is on the boundary until moved: its heat is delivered energy", async () => {
    const rows = await ledgerRows("2026-09");
    expect(rows.find((r) => r.carrier === "heat")?.imports_kwh).toBe(
      "8800.000000",
    );
  });

  it("is moved inside by a manager over the API; an auditor is refused and changes nothing", async () => {
    const path = `${base}/meters/${org.meters.water.id}`;
    const refused = await patchJson(auditor, path, { position: "internal" });
    expect(refused.status).toBe(403);
    const [before] = await db
      .select({ position: schema.meters.position })
      .from(schema.meters)
      .where(eq(schema.meters.id, org.meters.water.id));
    expect(before.position).toBe("boundary");
    const bad = await patchJson(manager, path, { position: "outside" });
    expect(bad.status).toBe(400);
    const moved = await patchJson(manager, path, { position: "internal" });
    expect(moved.status).toBe(200);
    expect(await moved.json()).toMatchObject({ position: "internal" });
  });

  it("another organisation cannot move it", async () => {
    const stranger = await createOrganization(["owner"]);
    const client = new Client();
    await client.signIn(
      stranger.members[0].email,
      stranger.members[0].password,
    );
    const response = await patchJson(
      client,
      `/api/v1/orgs/${stranger.id}/meters/${org.meters.water.id}`,
      { position: "boundary" },
    );
    expect(response.status).toBe(404);
  });

  it("leaves the ledger's delivered heat and the Overview, the gas staying", async () => {
    const rows = await ledgerRows("2026-09");
    expect(rows.map((r) => [r.carrier, r.imports_kwh])).toEqual([
      ["natural_gas", "10000.000000"],
    ]);
    const estate = await estateOverview(org.org.id, {
      silentHours: 24,
      now: new Date("2026-11-15T12:00:00Z"),
    });
    const carriers = new Set(
      (estate.byCarrier as { carrier: string }[]).map((c) => c.carrier),
    );
    expect(carriers.has("heat")).toBe(false);
    expect(carriers.has("natural_gas")).toBe(true);
  });

  it("shows in the site's balance as its own group and in the Meters list as inside the boundary", async () => {
    const html = await (
      await auditor.get(`/o/${org.org.id}/sites/${org.siteId}?month=2026-09`)
    ).text();
    const group = html.indexOf("Inside the boundary: plant inputs and outputs");
    expect(group).toBeGreaterThan(-1);
    expect(html.slice(group, group + 2000)).toContain(org.meters.water.code);
    const row = html.indexOf(`data-meter="${org.meters.water.code}"`);
    expect(html.slice(row, html.indexOf("</tr>", row))).toContain(
      "(inside the boundary)",
    );
    const meterPage = await (
      await auditor.get(`/o/${org.org.id}/meters/${org.meters.water.id}`)
    ).text();
    expect(meterPage.replace(/<!-- -->/g, "")).toContain(
      "inside the boundary · ",
    );
  });

  it("serves a boiler on the gas meter, whose over-reading month is flagged above 100 % gross", async () => {
    const plantPath = `/o/${org.org.id}/sites/${org.siteId}/plant`;
    const added = await manager.post(plantPath, {
      intent: "add-plant",
      name: "Boiler B1",
      kind: "boiler",
      fuelCvBasis: "gross",
      meter_fuel_in: gasMeterId,
      meter_heat_out: org.meters.water.id,
      heatFlowC: "80",
      heatReturnC: "60",
      chilledFlowC: "",
      chilledReturnC: "",
    });
    expect(added.status).toBe(200);
    const html = await (await auditor.get(plantPath)).text();
    const row = (month: string) => {
      const start = html.indexOf(`data-month="${month}"`);
      expect(start, month).toBeGreaterThan(-1);
      return html.slice(start, html.indexOf("</tr>", start));
    };
    // The internal meter's heat is still there for the plant.
    expect(row("2026-09")).toMatch(/8,?800/);
    expect(row("2026-09")).toContain("Within the laws");
    expect(row("2026-10")).toMatch(/10,?500/);
    expect(row("2026-10")).toContain("Metering fault");
  });

  it("gives the site's balance each boiler month's conversion loss, fuel in − heat out", async () => {
    const losses = async (month: string) => {
      const html = await (
        await auditor.get(`/o/${org.org.id}/sites/${org.siteId}?month=${month}`)
      ).text();
      const start = html.indexOf("data-conversion-losses");
      expect(start, month).toBeGreaterThan(-1);
      // React separates adjacent text with empty comments.
      return html
        .slice(start, html.indexOf("</ul>", start))
        .replace(/<!-- -->/g, "");
    };
    // 10,000 − 8,800 = 1,200 kWh lost in September.
    expect(await losses("2026-09")).toContain(
      "Boiler B1: fuel in 10,000 kWh − out 8,800 kWh",
    );
    expect(await losses("2026-09")).toMatch(/conversion loss 1,200 kWh/);
    // October's over-reading heat meter: a negative "loss", shown as a fault.
    const october = await losses("2026-10");
    expect(october).toMatch(/conversion loss [−-]500 kWh/);
    expect(october).toContain("Metering fault");
  });
});
