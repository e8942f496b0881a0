import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

const post = (org: MeteredOrg, readings: unknown[]) =>
  new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );

const register = (code: string, time: string, kwh: number) => ({
  meter: code,
  quantity: "electric_register",
  time,
  register_kwh: kwh,
});

/** Hourly register reads from `start` for `hours` hours, advancing by a varying step. */
function registerSeries(
  code: string,
  start: string,
  hours: number,
  first = 1000,
) {
  const t0 = new Date(start).getTime();
  let value = first;
  return Array.from({ length: hours + 1 }, (_, i) => {
    if (i > 0) value += 1 + ((i * 7) % 5) * 0.137;
    return register(
      code,
      new Date(t0 + i * 3_600_000).toISOString(),
      Math.round(value * 1000) / 1000,
    );
  });
}

type LedgerAnswer = {
  rows: {
    site_id: string;
    month: string;
    carrier: string;
    imports_kwh: string;
    exports_kwh: string;
    net_kwh: string;
    status: string;
    adjustments_kwh: string;
    adjustment_count: number;
  }[];
  totals: {
    carrier: string;
    imports_kwh: string;
    exports_kwh: string;
    net_kwh: string;
  }[];
};

async function member(org: MeteredOrg, index: number) {
  const client = new Client();
  await client.signIn(
    org.org.members[index].email,
    org.org.members[index].password,
  );
  return client;
}

async function ledger(
  client: Client,
  org: MeteredOrg,
  from: string,
  to: string,
) {
  const response = await client.get(
    `/api/v1/orgs/${org.org.id}/ledger?from=${from}&to=${to}`,
  );
  expect(response.status).toBe(200);
  return (await response.json()) as LedgerAnswer;
}

describe("monthly ledger", () => {
  it("each month equals the exact sum of its hours (site-local months), imports positive, exports negative", async () => {
    const org = await createMeteredOrg({ roles: ["auditor"] });
    // Across the end of March into April in Europe/London (the clocks change on 29 March 2026).
    await post(
      org,
      registerSeries(org.meters.register.code, "2026-03-30T20:00:00Z", 60),
    );
    await post(
      org,
      registerSeries(org.meters.export.code, "2026-03-31T09:00:00Z", 30, 500),
    );
    const answer = await ledger(
      await member(org, 0),
      org,
      "2026-03",
      "2026-04",
    );
    const { rows: sums } = await pool.query<{
      month: string;
      carrier: string;
      imports: string;
      exports: string;
      net: string;
    }>(
      `select to_char(date_trunc('month', i.interval_start at time zone 'Europe/London'), 'YYYY-MM') as month, m.carrier::text as carrier,
              coalesce(sum(i.energy_kwh) filter (where m.orientation = 'import'), 0)::text as imports,
              coalesce(sum(i.energy_kwh) filter (where m.orientation = 'export'), 0)::text as exports,
              sum(i.energy_kwh)::text as net
         from intervals i join meters m on m.organization_id = i.organization_id and m.id = i.meter_id
        where i.organization_id = $1 group by 1, 2 order by 1, 2`,
      [org.org.id],
    );
    expect(
      answer.rows.map((r) => [
        r.month,
        r.carrier,
        r.imports_kwh,
        r.exports_kwh,
        r.net_kwh,
      ]),
    ).toEqual(
      sums.map((s) => [s.month, s.carrier, s.imports, s.exports, s.net]),
    );
    expect(answer.rows).toHaveLength(2);
    for (const row of answer.rows) {
      expect(Number(row.imports_kwh)).toBeGreaterThan(0);
      expect(Number(row.exports_kwh)).toBeLessThan(0);
    }
    // One carrier here, so one total: its own rows' sum.
    const total = answer.rows.reduce((s, r) => s + Number(r.net_kwh), 0);
    expect(answer.totals.map((t) => t.carrier)).toEqual(["electricity"]);
    expect(Number(answer.totals[0].net_kwh)).toBeCloseTo(total, 6);
  });

  it("chilled water is stored negative by itself and shows as cooling delivered; sub-meters are not added to the boundary", async () => {
    const org = await createMeteredOrg({ roles: ["auditor"] });
    const [chilled] = await db
      .insert(schema.meters)
      .values({
        organizationId: org.org.id,
        siteId: org.siteId,
        code: `C-${org.tag}`,
        name: "Chilled water",
        quantity: "water_heat",
        carrier: "cooling",
        orientation: "import",
        sensorAt: "return",
        defaultPressureBarAbs: "4",
        installedAt: new Date("2020-01-01"),
      })
      .returning();
    await db.insert(schema.meters).values({
      organizationId: org.org.id,
      siteId: org.siteId,
      code: `S-${org.tag}`,
      name: "Sub-meter",
      quantity: "electric_register",
      carrier: "electricity",
      orientation: "import",
      parentMeterId: org.meters.register.id,
      installedAt: new Date("2020-01-01"),
    });
    await post(org, [
      {
        meter: chilled.code,
        quantity: "water_heat",
        start: "2026-06-10T12:00:00Z",
        end: "2026-06-10T13:00:00Z",
        volume_m3: 5,
        flow_temp_c: 6,
        return_temp_c: 12,
      },
      ...registerSeries(org.meters.register.code, "2026-06-10T12:00:00Z", 2),
      ...registerSeries(`S-${org.tag}`, "2026-06-10T12:00:00Z", 2, 50),
    ]);
    const answer = await ledger(
      await member(org, 0),
      org,
      "2026-06",
      "2026-06",
    );
    const cooling = answer.rows.find((r) => r.carrier === "cooling")!;
    // 5 m³ warmed by 6 K takes up about 5 × 1000 kg × 4.19 kJ/(kg·K) × 6 K ≈ 35 kWh (common practice):
    // stored as heat leaving the site, shown as cooling delivered.
    const { rows: stored } = await pool.query<{ e: string }>(
      "select sum(energy_kwh)::text as e from intervals where organization_id = $1 and meter_id = $2",
      [org.org.id, chilled.id],
    );
    expect(Number(stored[0].e)).toBeLessThan(-33);
    expect(Number(stored[0].e)).toBeGreaterThan(-36);
    expect(Number(cooling.imports_kwh)).toBe(-Number(stored[0].e));
    expect(cooling.net_kwh).toBe(cooling.imports_kwh);
    const electricity = answer.rows.find((r) => r.carrier === "electricity")!;
    const { rows } = await pool.query<{ e: string }>(
      "select sum(energy_kwh)::text as e from intervals where organization_id = $1 and meter_id = $2",
      [org.org.id, org.meters.register.id],
    );
    expect(electricity.net_kwh).toBe(rows[0].e);
  });

  it("a closed month is locked: late data becomes an adjusting entry; reopening needs an owner", async () => {
    const org = await createMeteredOrg({
      roles: ["owner", "energy_manager", "auditor", "finance"],
    });
    const code = org.meters.register.code;
    await post(org, [
      register(code, "2026-02-10T00:00:00Z", 100),
      register(code, "2026-02-10T02:00:00Z", 110),
    ]);
    const [owner, manager, auditor, finance] = await Promise.all(
      [0, 1, 2, 3].map((i) => member(org, i)),
    );
    const page = `/o/${org.org.id}/ledger`;
    for (const refused of [auditor, finance]) {
      expect(
        (
          await refused.post(page, {
            intent: "close",
            month: "2026-02",
            siteId: "",
          })
        ).status,
      ).toBe(403);
    }
    expect(
      (
        await manager.post(page, {
          intent: "close",
          month: "2099-02",
          siteId: "",
        })
      ).status,
    ).toBe(409);
    expect(
      (
        await manager.post(page, {
          intent: "close",
          month: "2026-02",
          siteId: "",
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await manager.post(page, {
          intent: "close",
          month: "2026-02",
          siteId: org.siteId,
        })
      ).status,
    ).toBe(409);
    const closed = await ledger(auditor, org, "2026-02", "2026-02");
    expect(closed.rows[0]).toMatchObject({
      status: "closed",
      net_kwh: "10.000000",
      adjustments_kwh: "0",
      adjustment_count: 0,
    });

    // A late read in the closed month: the figures stay, the change is shown beside them.
    await post(org, [register(code, "2026-02-10T04:00:00Z", 125)]);
    const adjusted = await ledger(auditor, org, "2026-02", "2026-02");
    expect(adjusted.rows[0]).toMatchObject({
      status: "closed",
      net_kwh: "10.000000",
      adjustments_kwh: "15.000000",
      adjustment_count: 1,
    });
    const [entry] = await db
      .select()
      .from(schema.ledgerAdjustments)
      .where(
        and(
          eq(schema.ledgerAdjustments.organizationId, org.org.id),
          eq(schema.ledgerAdjustments.month, "2026-02-01"),
        ),
      );
    expect(entry).toMatchObject({
      source: "late_data",
      gatewayId: org.gatewayId,
      deltaKwh: "15.000000",
    });

    expect(
      (
        await manager.post(page, {
          intent: "reopen",
          month: "2026-02",
          siteId: "",
          reason: "auditor asked for it",
        })
      ).status,
    ).toBe(403);
    expect(
      (
        await owner.post(page, {
          intent: "reopen",
          month: "2026-02",
          siteId: "",
          reason: "",
        })
      ).status,
    ).toBe(400);
    expect(
      (
        await owner.post(page, {
          intent: "reopen",
          month: "2026-02",
          siteId: "",
          reason: "Late reads from the pavilion gateway",
        })
      ).status,
    ).toBe(200);
    const reopened = await ledger(auditor, org, "2026-02", "2026-02");
    expect(reopened.rows[0]).toMatchObject({
      status: "open",
      net_kwh: "25.000000",
    });
    const audit = await db
      .select({ action: schema.auditLog.action })
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          sql`${schema.auditLog.action} like 'month.%'`,
        ),
      );
    expect(audit.map((a) => a.action).sort()).toEqual([
      "month.closed",
      "month.reopened",
    ]);
  });

  it("exports CSV and XLSX of the same rows; other organisations and bad ranges are refused", async () => {
    const org = await createMeteredOrg({ roles: ["finance"] });
    await post(
      org,
      registerSeries(org.meters.register.code, "2026-05-01T00:00:00Z", 3),
    );
    const finance = await member(org, 0);
    const csv = await finance.get(
      `/api/v1/orgs/${org.org.id}/ledger.csv?from=2026-05&to=2026-05`,
    );
    expect(csv.headers.get("content-type")).toMatch(/text\/csv/);
    const lines = (await csv.text()).trim().split("\n");
    expect(lines[0]).toBe(
      "Site,Month,Carrier,Delivered (kWh),Exported (kWh),Net (kWh),Estimated (kWh),Estimated share (%),± uncertainty (kWh),Adjustments (kWh),Adjustment count,Cost,Currency,Status,CO₂e location-based (kg),CO₂e market-based (kg)",
    );
    const json = await ledger(finance, org, "2026-05", "2026-05");
    // The entries, then one total row for the one carrier.
    expect(lines).toHaveLength(json.rows.length + 2);
    expect(lines.slice(1, -1).map((l) => Number(l.split(",")[5]))).toEqual(
      json.rows.map((r) => Number(r.net_kwh)),
    );
    expect(lines.at(-1)!.split(",").slice(0, 3)).toEqual([
      "Total",
      "",
      "Electricity",
    ]);
    const xlsx = await finance.get(
      `/api/v1/orgs/${org.org.id}/ledger.xlsx?from=2026-05&to=2026-05`,
    );
    expect(xlsx.status).toBe(200);
    expect(
      Buffer.from(await xlsx.arrayBuffer())
        .subarray(0, 2)
        .toString(),
    ).toBe("PK");

    expect(
      (
        await finance.get(
          `/api/v1/orgs/${org.org.id}/ledger?from=2026-13&to=2026-05`,
        )
      ).status,
    ).toBe(400);
    expect(
      (
        await finance.get(
          `/api/v1/orgs/${org.org.id}/ledger?from=2026-06&to=2026-05`,
        )
      ).status,
    ).toBe(400);
    const other = await createMeteredOrg({ roles: ["owner"] });
    const stranger = await member(other, 0);
    expect(
      (
        await stranger.get(
          `/api/v1/orgs/${org.org.id}/ledger?from=2026-05&to=2026-05`,
        )
      ).status,
    ).toBe(404);
    expect((await stranger.get(`/o/${org.org.id}/ledger`)).status).toBe(404);
  });
});

describe("EN 1434 uncertainty band", () => {
  it("a rated heat meter's readings carry their MPE into the ledger's heat totals", async () => {
    const org = await createMeteredOrg({ roles: ["auditor"] });
    await db
      .update(schema.meters)
      .set({ accuracyClass: 2, deltaThetaMinK: "3", qpM3PerH: "2.5" })
      .where(eq(schema.meters.id, org.meters.water.id));
    await post(org, [
      {
        meter: org.meters.water.code,
        quantity: "water_heat",
        start: "2026-07-01T10:00:00Z",
        end: "2026-07-01T11:00:00Z",
        volume_m3: 2,
        flow_temp_c: 75,
        return_temp_c: 50,
      },
    ]);
    const answer = await ledger(
      await member(org, 0),
      org,
      "2026-07",
      "2026-07",
    );
    const heat = answer.rows.find((r) => r.carrier === "heat") as unknown as {
      net_kwh: string;
      uncertainty_kwh: string;
    };
    // Class 2 (MID Annex VI MI-004 / EN 1434-1, references.md §3): E = Ef + Et + Ec with
    // Ef = 2 + 0.02·qp/q = 2 + 0.02·2.5/2, Et = 0.5 + 3·Δθmin/Δθ = 0.5 + 9/25, Ec = 0.5 + Δθmin/Δθ = 0.5 + 3/25,
    // so 3.505 % of the energy.
    expect(Number(heat.uncertainty_kwh)).toBeCloseTo(
      Number(heat.net_kwh) * 0.03505,
      5,
    );
  });
});
