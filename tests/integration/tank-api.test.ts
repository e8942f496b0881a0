/**
 * An oil tank over the JSON API: an energy manager makes a gas-oil meter a
 * tank, enters dips and a delivery; the consumption between consecutive dips
 * and its energy come back exactly, and the meter's intervals between the
 * dips add up to it to the µkWh, marked estimated. A negative consumption and
 * a dip above the capacity are refused naming their fields, with nothing
 * stored; a late delivery in a closed month gives an adjusting entry;
 * auditors read but may not write; another organisation's ids are not found;
 * every entry is audited.
 */
import Decimal from "decimal.js-light";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createOrganization, db, pool, schema } from "../support/db";
import { Client } from "../support/http";

afterAll(() => pool.end());

type Json = Record<string, unknown>;
interface Period {
  from: string;
  to: string;
  consumption_l: string;
  deliveries_l: string;
  energy_kwh: string;
}
interface IntervalRow {
  start: string;
  energy_kwh: string;
  quality: string;
  estimate_method: string | null;
}

async function signedIn(member: { email: string; password: string }) {
  const client = new Client();
  await client.signIn(member.email, member.password);
  return client;
}

describe("an oil tank over the API", () => {
  let manager: Client;
  let auditor: Client;
  let stranger: Client;
  let orgId: string;
  let otherOrgId: string;
  let tankPath: string;
  let meterId: string;

  beforeAll(async () => {
    await db.delete(schema.signInAttempts);
    const org = await createOrganization(["energy_manager", "auditor"]);
    const other = await createOrganization(["energy_manager"]);
    orgId = org.id;
    otherOrgId = other.id;
    manager = await signedIn(org.members[0]);
    auditor = await signedIn(org.members[1]);
    stranger = await signedIn(other.members[0]);
    const base = `/api/v1/orgs/${orgId}`;
    const site = (await (
      await manager.postJson(`${base}/sites`, {
        name: "Depot",
        time_zone: "Europe/London",
      })
    ).json()) as Json;
    const meter = await manager.postJson(`${base}/meters`, {
      site_id: site.id,
      code: "OT-1",
      name: "Standby boiler oil tank",
      quantity: "liquid_fuel",
      carrier: "gas_oil",
      orientation: "import",
      interval_minutes: 60,
      installed_at: "2026-01-01",
    });
    expect(meter.status).toBe(201);
    meterId = ((await meter.json()) as Json).id as string;
    tankPath = `${base}/meters/${meterId}`;
  });

  const dips = () => manager.get(`${tankPath}/tank-dips`);
  const dipCount = async () =>
    ((await (await dips()).json()) as { dips: unknown[] }).dips.length;

  async function intervals(from: string, to: string): Promise<IntervalRow[]> {
    const page = await manager.get(
      `${tankPath}/intervals?from=${from}&to=${to}`,
    );
    expect(page.status).toBe(200);
    return ((await page.json()) as { intervals: IntervalRow[] }).intervals;
  }

  const sum = (rows: { energy_kwh: string }[]) =>
    rows.reduce((n, r) => n.plus(r.energy_kwh), new Decimal(0)).toFixed(6);

  it("turns dips and a delivery into periods and interval energies, exactly", async () => {
    expect((await manager.get(`${tankPath}/tank-dips`)).status).toBe(404);
    const settings = await manager.postJson(`${tankPath}/tank`, {
      capacity_l: 5000,
      density_kg_l: 0.845,
      calorific_value_mj_kg: 45.5,
    });
    expect(settings.status).toBe(200);
    expect(await settings.json()).toMatchObject({
      capacity_l: "5000.000",
      cv_basis: "gross",
    });

    const post = (path: string, body: Json) =>
      manager.postJson(`${tankPath}/${path}`, body);
    expect(
      (await post("tank-dips", { time: "2026-01-05T00:00:00Z", stock_l: 4000 }))
        .status,
    ).toBe(201);
    const second = await post("tank-dips", {
      time: "2026-01-05T06:00:00Z",
      stock_l: 3900,
    });
    expect(second.status).toBe(201);
    // 100 l × 0.845 kg/l × 45.5 MJ/kg / 3.6 = 1067.986111 kWh.
    expect(((await second.json()) as { periods: Period[] }).periods).toEqual([
      expect.objectContaining({
        consumption_l: "100.000",
        energy_kwh: "1067.986111",
      }),
    ]);
    const delivery = await post("tank-deliveries", {
      time: "2026-01-05T09:00:00Z",
      volume_l: 1000,
      density_kg_l: 0.84,
      calorific_value_mj_kg: 45.6,
      note: "Note 4471",
    });
    expect(delivery.status).toBe(201);
    expect(
      (await post("tank-dips", { time: "2026-01-05T12:00:00Z", stock_l: 4750 }))
        .status,
    ).toBe(201);

    const list = (await (await dips()).json()) as { periods: Period[] };
    // 3900 + 1000 − 4750 = 150 l, priced by the delivery note:
    // 150 × 0.84 × 45.6 / 3.6 = 1596 kWh.
    expect(
      list.periods.map((p) => [p.deliveries_l, p.consumption_l, p.energy_kwh]),
    ).toEqual([
      ["0.000", "100.000", "1067.986111"],
      ["1000.000", "150.000", "1596.000000"],
    ]);

    const hours = await intervals(
      "2026-01-05T00:00:00Z",
      "2026-01-05T12:00:00Z",
    );
    expect(hours).toHaveLength(12);
    expect(
      hours.every(
        (h) => h.quality === "estimated" && h.estimate_method === "tank_spread",
      ),
    ).toBe(true);
    // The µkWh left over by 1067.986111 / 6 goes to the first hour.
    expect(hours.slice(0, 6).map((h) => h.energy_kwh)).toEqual([
      "177.997686",
      ...Array(5).fill("177.997685"),
    ]);
    expect(sum(hours.slice(0, 6))).toBe("1067.986111");
    expect(hours.slice(6).map((h) => h.energy_kwh)).toEqual(
      Array(6).fill("266.000000"),
    );

    const [rollup] = await db
      .select({ energyKwh: schema.monthlyRollups.energyKwh })
      .from(schema.monthlyRollups)
      .where(eq(schema.monthlyRollups.meterId, meterId));
    expect(rollup.energyKwh).toBe("2663.986111");
  });

  it("refuses a negative consumption and a dip above capacity, storing nothing", async () => {
    const before = await dipCount();
    const negative = await manager.postJson(`${tankPath}/tank-dips`, {
      time: "2026-01-05T18:00:00Z",
      stock_l: 4800,
    });
    expect(negative.status).toBe(400);
    const body = (await negative.json()) as {
      error: { code: string; message: string; issues: { path: string }[] };
    };
    expect(body.error.code).toBe("negative_consumption");
    expect(body.error.issues.map((i) => i.path)).toEqual([
      "opening_stock_l",
      "deliveries_l",
      "closing_stock_l",
    ]);
    expect(body.error.message).toContain("4750.000 + 0.000 − 4800 = −50 l");

    const tooFull = await manager.postJson(`${tankPath}/tank-dips`, {
      time: "2026-01-05T18:00:00Z",
      stock_l: 5200,
    });
    expect(tooFull.status).toBe(400);
    expect(JSON.stringify(await tooFull.json())).toContain(
      "stock_l: 5200 l is outside 0 l to 5000 l",
    );
    expect(await dipCount()).toBe(before);
    expect(
      await intervals("2026-01-05T12:00:00Z", "2026-01-06T00:00:00Z"),
    ).toEqual([]);
  });

  it("turns a late delivery in a closed month into an adjusting entry", async () => {
    await db.insert(schema.monthCloses).values({
      organizationId: orgId,
      month: "2026-01-01",
      siteId: null,
    });
    const late = await manager.postJson(`${tankPath}/tank-deliveries`, {
      time: "2026-01-05T03:00:00Z",
      volume_l: 200,
    });
    expect(late.status).toBe(201);
    const answer = (await late.json()) as {
      adjustments: number;
      periods: Period[];
    };
    expect(answer.adjustments).toBe(1);
    // 300 l at the declared fuel: 300 × 0.845 × 45.5 / 3.6 = 3203.958333.
    expect(answer.periods[0]).toMatchObject({
      consumption_l: "300.000",
      energy_kwh: "3203.958333",
    });
    const adjustments = await db
      .select({ deltaKwh: schema.ledgerAdjustments.deltaKwh })
      .from(schema.ledgerAdjustments)
      .where(
        and(
          eq(schema.ledgerAdjustments.organizationId, orgId),
          eq(schema.ledgerAdjustments.meterId, meterId),
        ),
      );
    expect(adjustments.map((a) => a.deltaKwh)).toEqual(["2135.972222"]);
    const hours = await intervals(
      "2026-01-05T00:00:00Z",
      "2026-01-05T06:00:00Z",
    );
    expect(sum(hours)).toBe("3203.958333");
  });

  it("lets an auditor read but not write, hides the tank from other organisations, and audits every entry", async () => {
    expect((await auditor.get(`${tankPath}/tank-dips`)).status).toBe(200);
    expect((await auditor.get(`${tankPath}/tank-deliveries`)).status).toBe(200);
    const refused = await auditor.postJson(`${tankPath}/tank-dips`, {
      time: "2026-01-06T00:00:00Z",
      stock_l: 4500,
    });
    expect(refused.status).toBe(403);

    expect((await stranger.get(`${tankPath}/tank-dips`)).status).toBe(404);
    const asOther = `/api/v1/orgs/${otherOrgId}/meters/${meterId}`;
    expect((await stranger.get(`${asOther}/tank-dips`)).status).toBe(404);
    const foreignPost = await stranger.postJson(`${asOther}/tank-deliveries`, {
      time: "2026-01-06T00:00:00Z",
      volume_l: 100,
    });
    expect(foreignPost.status).toBe(404);

    const actions = await db
      .select({ action: schema.auditLog.action })
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, orgId),
          eq(schema.auditLog.meterId, meterId),
        ),
      )
      .orderBy(schema.auditLog.id);
    expect(actions.map((a) => a.action)).toEqual([
      "meter.created",
      "tank.saved",
      "tank.dip_entered",
      "tank.dip_entered",
      "tank.delivery_entered",
      "tank.dip_entered",
      "tank.delivery_entered",
      "ledger.adjusted",
    ]);
  });
});
