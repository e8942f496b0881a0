/**
 * Tariffs end to end: an energy manager prices a half-hourly supply with a
 * day/night tariff, a maximum-demand charge, a levy, an export rate and VAT;
 * the ledger API's rows carry cost and currency, equal to the tariff applied
 * by hand here, and its totals are the exact sums of the rows; a new
 * version after a month is closed leaves the closed cost as it was and adds
 * an adjusting entry; bad input is refused with the reason and stores
 * nothing; an auditor reads but cannot write; another organisation gets 404.
 */
import Decimal from "decimal.js-light";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());

type Json = Record<string, unknown>;
interface LedgerAnswer {
  rows: {
    site_id: string;
    month: string;
    carrier: string;
    cost: string | null;
    currency: string | null;
    adjustments_cost: string | null;
    status: string;
  }[];
  totals: { carrier: string; cost: string | null; currency: string | null }[];
  cost_totals: { currency: string; cost: string }[];
}

const HALF_HOUR = 1_800_000;
/**
 * The end of February and the start of March 2026, without a gap (a gap
 * would be estimated and priced too): GMT, so local time is UTC.
 */
const FIRST = Date.parse("2026-02-26T00:00:00Z");
const DAYS = 5;

const rates = (day: string, over: Json = {}) => ({
  bands: [
    { name: "Day", rate_per_kwh: day, windows: "Mon-Sun 07:00-23:00" },
    { name: "Night", rate_per_kwh: "0.15", windows: "Mon-Sun 23:00-07:00" },
  ],
  standing_charge_per_day: "1.25",
  capacity_charge_per_day: "0.5",
  max_demand_rate_per_kw_month: "3.2",
  levies: [{ name: "Climate levy", rate_per_kwh: "0.00775" }],
  export_rate_per_kwh: "0.05",
  vat_percent: "20",
  ...over,
});

/** Half-hour i's kWh: distinct, three decimals. */
const importKwh = (i: number) => (1 + ((i * 37) % 50) / 8).toFixed(3);
const exportKwh = (i: number) => ((i % 5) / 4).toFixed(2);

/** The tariff applied by hand to one month of the test's half-hours (Decimal, exact). */
function expectedCost(
  halfHours: { start: number; imp: string; exp: string }[],
  days: number,
  day: string,
): string {
  let energy = new Decimal(0);
  let imported = new Decimal(0);
  let exported = new Decimal(0);
  let maxKw = new Decimal(0);
  for (const h of halfHours) {
    const hour = new Date(h.start).getUTCHours();
    const rate = hour >= 7 && hour < 23 ? day : "0.15";
    energy = energy.plus(new Decimal(h.imp).times(rate));
    imported = imported.plus(h.imp);
    exported = exported.plus(h.exp);
    const kw = new Decimal(h.imp).times(2);
    if (kw.gt(maxKw)) maxKw = kw;
  }
  const charged = energy
    .plus(imported.times("0.00775"))
    .plus(new Decimal("1.75").times(days))
    .plus(maxKw.times("3.2"));
  return charged.times("1.2").minus(exported.times("0.05")).toString();
}

describe("tariffs and the cost in the ledger", () => {
  let org: MeteredOrg;
  let other: Awaited<ReturnType<typeof createOrganization>>;
  let manager: Client;
  let auditor: Client;
  let stranger: Client;
  let base: string;
  let tariffId: string;
  const halfHours: { start: number; imp: string; exp: string }[] = [];

  async function meter(code: string, orientation: string) {
    const r = await manager.postJson(`${base}/meters`, {
      site_id: org.siteId,
      code,
      name: code,
      quantity: "electric_work",
      carrier: "electricity",
      orientation,
      interval_minutes: 30,
      installed_at: "2026-01-01",
    });
    expect(r.status).toBe(201);
  }

  const ledger = async (from = "2026-02", to = "2026-03") => {
    const r = await manager.request(`${base}/ledger?from=${from}&to=${to}`);
    expect(r.status).toBe(200);
    return (await r.json()) as LedgerAnswer;
  };
  const electricityRow = (l: LedgerAnswer, month: string) =>
    l.rows.find((r) => r.month === month && r.carrier === "electricity")!;
  const versionCount = async () =>
    (
      await db
        .select()
        .from(schema.tariffVersions)
        .where(eq(schema.tariffVersions.organizationId, org.org.id))
    ).length;

  beforeAll(async () => {
    await db.delete(schema.signInAttempts);
    org = await createMeteredOrg({ roles: ["energy_manager", "auditor"] });
    other = await createOrganization(["energy_manager"]);
    manager = new Client();
    await manager.signIn(org.org.members[0].email, org.org.members[0].password);
    auditor = new Client();
    await auditor.signIn(org.org.members[1].email, org.org.members[1].password);
    stranger = new Client();
    await stranger.signIn(other.members[0].email, other.members[0].password);
    base = `/api/v1/orgs/${org.org.id}`;
    // The metered org's register meters stay silent; two interval meters carry the supply.
    const imp = `TI-${org.tag}`;
    const exp = `TX-${org.tag}`;
    await meter(imp, "import");
    await meter(exp, "export");
    const readings: Json[] = [];
    const starts = Array.from(
      { length: DAYS * 48 },
      (_, i) => FIRST + i * HALF_HOUR,
    );
    starts.forEach((start, i) => {
      const h = { start, imp: importKwh(i), exp: exportKwh(i) };
      halfHours.push(h);
      for (const [code, kwh] of [
        [imp, h.imp],
        [exp, h.exp],
      ])
        readings.push({
          meter: code,
          quantity: "interval_energy",
          start: new Date(start).toISOString(),
          end: new Date(start + HALF_HOUR).toISOString(),
          energy_kwh: Number(kwh),
        });
    });
    const posted = await new Client().postJson(
      "/api/v1/readings",
      { readings },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(posted.status).toBe(200);
    expect(((await posted.json()) as { rejected: unknown[] }).rejected).toEqual(
      [],
    );
  });

  it("refuses bad tariffs with the reason and stores nothing", async () => {
    const body = (over: Json, version: Json = {}) => ({
      name: "Grid supply",
      site_id: org.siteId,
      carrier: "electricity",
      currency: "GBP",
      first_version: {
        valid_from: "2026-01-01",
        rates: rates("0.30"),
        ...version,
      },
      ...over,
    });
    const gap = await manager.postJson(
      `${base}/tariffs`,
      body(
        {},
        {
          rates: rates("0.30", {
            bands: [
              {
                name: "Day",
                rate_per_kwh: "0.3",
                windows: "Mon-Fri 07:00-23:00",
              },
              {
                name: "Night",
                rate_per_kwh: "0.15",
                windows: "Mon-Sun 23:00-07:00",
              },
            ],
          }),
        },
      ),
    );
    expect(gap.status).toBe(400);
    expect(JSON.stringify(await gap.json())).toContain(
      "do not cover the whole week: no band for Sat 07:00 to Sat 23:00",
    );
    const negative = await manager.postJson(
      `${base}/tariffs`,
      body({}, { rates: rates("0.30", { standing_charge_per_day: "-1" }) }),
    );
    expect(negative.status).toBe(400);
    expect(JSON.stringify(await negative.json())).toContain(
      "Standing charge per day must not be negative",
    );
    const foreignSite = await manager.postJson(
      `${base}/tariffs`,
      body({ site_id: other.id }),
    );
    expect(foreignSite.status).toBe(400);
    const byAuditor = await auditor.postJson(`${base}/tariffs`, body({}));
    expect(byAuditor.status).toBe(403);
    expect(await versionCount()).toBe(0);
    const tariffs = await db
      .select()
      .from(schema.tariffs)
      .where(eq(schema.tariffs.organizationId, org.org.id));
    expect(tariffs).toEqual([]);
  });

  it("prices every ledger row from the intervals, with totals that are the exact sums of the rows", async () => {
    const created = await manager.postJson(`${base}/tariffs`, {
      name: "Grid supply",
      site_id: org.siteId,
      carrier: "electricity",
      currency: "GBP",
      first_version: { valid_from: "2026-01-01", rates: rates("0.30") },
    });
    expect(created.status).toBe(201);
    tariffId = ((await created.json()) as { id: string }).id;

    const l = await ledger();
    const feb = electricityRow(l, "2026-02");
    const mar = electricityRow(l, "2026-03");
    expect(feb).toMatchObject({ currency: "GBP", adjustments_cost: "0" });
    expect(feb.cost).toBe(
      expectedCost(
        halfHours.filter((h) => h.start < Date.parse("2026-03-01")),
        28,
        "0.30",
      ),
    );
    expect(mar.cost).toBe(
      expectedCost(
        halfHours.filter((h) => h.start >= Date.parse("2026-03-01")),
        31,
        "0.30",
      ),
    );
    const sum = l.rows
      .filter((r) => r.cost !== null)
      .reduce((s, r) => s.plus(r.cost!), new Decimal(0))
      .toString();
    expect(l.cost_totals).toEqual([{ currency: "GBP", cost: sum }]);
    expect(l.totals.find((t) => t.carrier === "electricity")).toMatchObject({
      cost: sum,
      currency: "GBP",
    });

    // The CSV carries the cost and its currency beside the energy.
    const csv = await (
      await manager.request(`${base}/ledger.csv?from=2026-02&to=2026-03`)
    ).text();
    expect(csv.split("\n")[0]).toContain("Cost,Currency");
    expect(csv).toContain(`${feb.cost},GBP`);

    // Every member reads the tariffs; another organisation's member gets 404.
    const list = await auditor.request(`${base}/tariffs`);
    expect(list.status).toBe(200);
    expect(
      ((await list.json()) as { tariffs: unknown[] }).tariffs,
    ).toHaveLength(1);
    expect((await stranger.request(`${base}/tariffs`)).status).toBe(404);
    const strangerVersion = await stranger.postJson(
      `/api/v1/orgs/${other.id}/tariffs/${tariffId}/versions`,
      { valid_from: "2026-02-15", rates: rates("0.40") },
    );
    expect(strangerVersion.status).toBe(404);
  });

  it("a new version after the month is closed keeps the closed cost and adds an adjusting entry", async () => {
    const before = electricityRow(await ledger(), "2026-02");
    await db.insert(schema.monthCloses).values({
      organizationId: org.org.id,
      siteId: org.siteId,
      month: "2026-02-01",
    });
    const changed = await manager.postJson(
      `${base}/tariffs/${tariffId}/versions`,
      {
        valid_from: "2026-02-27",
        rates: rates("0.40"),
      },
    );
    expect(changed.status).toBe(201);
    const versions = ((await changed.json()) as { versions: Json[] }).versions;
    // The open first version now ends the day before the new one.
    expect(versions.map((v) => [v.valid_from, v.valid_to])).toEqual([
      ["2026-01-01", "2026-02-26"],
      ["2026-02-27", null],
    ]);

    const after = electricityRow(await ledger(), "2026-02");
    expect(after.status).toBe("closed");
    expect(after.cost).toBe(before.cost);
    const adjustments = await db
      .select()
      .from(schema.costAdjustments)
      .where(eq(schema.costAdjustments.organizationId, org.org.id));
    expect(adjustments).toHaveLength(1);
    expect(adjustments[0]).toMatchObject({ source: "tariff", currency: "GBP" });
    expect(after.adjustments_cost).toBe(
      new Decimal(adjustments[0].deltaCost).toString(),
    );
    // Day energy of 27 and 28 February now at 0.40: the adjustment is positive.
    expect(Number(after.adjustments_cost)).toBeGreaterThan(0);
    const audited = await db
      .select()
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.action, "ledger.cost_adjusted"),
        ),
      );
    expect(audited).toHaveLength(1);

    // An overlap with a version that has an end is refused, and nothing changes.
    const count = await versionCount();
    const overlap = await manager.postJson(
      `${base}/tariffs/${tariffId}/versions`,
      {
        valid_from: "2026-01-15",
        valid_to: "2026-01-20",
        rates: rates("0.50"),
      },
    );
    expect(overlap.status).toBe(400);
    expect(JSON.stringify(await overlap.json())).toContain(
      "Overlaps the version valid from 2026-01-01 to 2026-02-26",
    );
    expect(await versionCount()).toBe(count);
    const byAuditor = await auditor.postJson(
      `${base}/tariffs/${tariffId}/versions`,
      {
        valid_from: "2026-04-01",
        rates: rates("0.50"),
      },
    );
    expect(byAuditor.status).toBe(403);
    expect(await versionCount()).toBe(count);
  });
});
