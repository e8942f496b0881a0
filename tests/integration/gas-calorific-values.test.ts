/**
 * A gas supply's calorific values over the JSON API (issue #15): an energy
 * manager enters monthly CVs and a day's override, a gateway sends volumes
 * without a CV, each interval takes its day's CV (V × correction × CV / 3.6),
 * a corrected CV in a closed month becomes an adjusting entry, and a gas
 * register in hundreds of cubic feet rolls over like any register. Bad input
 * changes nothing; roles and tenancy hold as for meters.
 */
import { and, asc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db, pool, schema } from "../support/db";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

type Json = Record<string, unknown>;
type Answer = {
  accepted: number;
  rejected: { index: number; reason: string }[];
};

let org: MeteredOrg;
let other: MeteredOrg;
let manager: Client;
let auditor: Client;
let stranger: Client;
let base: string;
let gasId: string;
let gasCode: string;

const CORRECTION = 1.02;
/** The energy the design states, to the six decimals intervals keep. */
const kwh = (volume: number, cv: number, correction = CORRECTION) =>
  ((volume * correction * cv) / 3.6).toFixed(6);

afterAll(async () => {
  await pool.end();
});

async function signedIn(o: MeteredOrg, index: number) {
  const client = new Client();
  await client.signIn(
    o.org.members[index].email,
    o.org.members[index].password,
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

async function intervalsOf(meterId: string) {
  const rows = await db
    .select({
      start: schema.intervals.intervalStart,
      energyKwh: schema.intervals.energyKwh,
      flags: schema.intervals.flags,
    })
    .from(schema.intervals)
    .where(
      and(
        eq(schema.intervals.organizationId, org.org.id),
        eq(schema.intervals.meterId, meterId),
      ),
    )
    .orderBy(asc(schema.intervals.intervalStart));
  return rows.map((r) => ({ ...r, start: r.start.toISOString() }));
}

async function rollupOf(meterId: string, month: string) {
  const [row] = await db
    .select({ energyKwh: schema.monthlyRollups.energyKwh })
    .from(schema.monthlyRollups)
    .where(
      and(
        eq(schema.monthlyRollups.organizationId, org.org.id),
        eq(schema.monthlyRollups.meterId, meterId),
        eq(schema.monthlyRollups.month, month),
      ),
    );
  return row?.energyKwh;
}

const cvPath = () => `${base}/meters/${gasId}/calorific-values`;

const volume = (start: string, end: string, m3: number) => ({
  meter: gasCode,
  quantity: "gas_volume",
  start,
  end,
  volume_m3: m3,
});

beforeAll(async () => {
  org = await createMeteredOrg({ roles: ["energy_manager", "auditor"] });
  other = await createMeteredOrg({ roles: ["energy_manager"] });
  manager = await signedIn(org, 0);
  auditor = await signedIn(org, 1);
  stranger = await signedIn(other, 0);
  base = `/api/v1/orgs/${org.org.id}`;
  gasCode = `GAS-${org.tag}`;
  const created = await manager.postJson(`${base}/meters`, {
    site_id: org.siteId,
    code: gasCode,
    name: "Boiler house gas",
    quantity: "gas_volume",
    carrier: "natural_gas",
    orientation: "import",
    interval_minutes: 60,
    installed_at: "2020-01-01",
  });
  expect(created.status).toBe(201);
  gasId = ((await created.json()) as Json).id as string;
  const settings = await manager.postJson(
    `${base}/meters/${gasId}/gas-settings`,
    { correction_factor: CORRECTION },
  );
  expect(settings.status).toBe(200);
});

describe("calorific values of a gas supply", () => {
  it("refuses bad input naming the field and the range, other organisations and read-only roles, storing nothing", async () => {
    const tooHigh = await manager.postJson(cvPath(), {
      period: "2026-01",
      calorific_value_mj_m3: 65,
    });
    expect(tooHigh.status).toBe(400);
    const body = (await tooHigh.json()) as {
      error: { issues: { path: string; message: string }[] };
    };
    expect(body.error.issues[0]).toMatchObject({
      path: "calorific_value_mj_m3",
      message: expect.stringContaining("must be 10 to 60 MJ/m³"),
    });
    // One bad entry of several: none is stored.
    const mixed = await manager.postJson(cvPath(), {
      entries: [
        { period: "2026-01", calorific_value_mj_m3: 39 },
        { period: "2026-02-30", calorific_value_mj_m3: 39 },
      ],
    });
    expect(mixed.status).toBe(400);
    expect(await mixed.text()).toContain("period: expected a month");

    const byAuditor = await auditor.postJson(cvPath(), {
      period: "2026-01",
      calorific_value_mj_m3: 39,
    });
    expect(byAuditor.status).toBe(403);
    expect((await auditor.get(cvPath())).status).toBe(200);

    const otherOrgPath = `/api/v1/orgs/${other.org.id}/meters/${gasId}/calorific-values`;
    expect((await stranger.get(otherOrgPath)).status).toBe(404);
    const posted = await stranger.postJson(otherOrgPath, {
      period: "2026-01",
      calorific_value_mj_m3: 39,
    });
    expect(posted.status).toBe(404);
    expect((await stranger.get(cvPath())).status).toBe(404);

    const list = (await (await auditor.get(cvPath())).json()) as Json;
    expect(list.calorific_values).toEqual([]);
  });

  it("prices readings without a CV at their day's value (a day beats its month) and refuses a day without one", async () => {
    const saved = await manager.postJson(cvPath(), {
      entries: [
        { period: "2026-01", calorific_value_mj_m3: 39.0, source: "Bill Jan" },
        { period: "2026-02", calorific_value_mj_m3: 39.5 },
        { period: "2026-02-10", calorific_value_mj_m3: 38.8, basis: "gross" },
      ],
    });
    expect(saved.status).toBe(201);
    expect(await saved.json()).toMatchObject({
      saved: 3,
      intervals_repriced: 0,
      calorific_values: [
        { period: "2026-01", period_kind: "month", calorific_value_mj_m3: 39 },
        {
          period: "2026-02",
          period_kind: "month",
          calorific_value_mj_m3: 39.5,
        },
        {
          period: "2026-02-10",
          period_kind: "day",
          calorific_value_mj_m3: 38.8,
        },
      ],
    });

    const answer = await postReadings([
      volume("2026-01-15T10:00:00Z", "2026-01-15T11:00:00Z", 12.5),
      volume("2026-02-10T10:00:00Z", "2026-02-10T11:00:00Z", 10),
      volume("2026-02-11T10:00:00Z", "2026-02-11T11:00:00Z", 10),
      volume("2026-03-02T10:00:00Z", "2026-03-02T11:00:00Z", 10),
      // A reading with its own CV keeps it.
      {
        ...volume("2026-02-12T10:00:00Z", "2026-02-12T11:00:00Z", 10),
        calorific_value_mj_m3: 41,
      },
    ]);
    expect(answer.accepted).toBe(4);
    expect(answer.rejected).toEqual([
      {
        index: 3,
        meter: gasCode,
        reason: expect.stringContaining(
          "no calorific value for 2026-03-02 (site-local day)",
        ),
      },
    ]);
    expect(await intervalsOf(gasId)).toEqual([
      expect.objectContaining({
        start: "2026-01-15T10:00:00.000Z",
        energyKwh: kwh(12.5, 39.0),
      }),
      expect.objectContaining({
        start: "2026-02-10T10:00:00.000Z",
        energyKwh: kwh(10, 38.8),
      }),
      expect.objectContaining({
        start: "2026-02-11T10:00:00.000Z",
        energyKwh: kwh(10, 39.5),
      }),
      expect.objectContaining({
        start: "2026-02-12T10:00:00.000Z",
        energyKwh: kwh(10, 41),
      }),
    ]);
  });

  it("a corrected CV in a closed month reprices its intervals and becomes an adjusting entry", async () => {
    const febBefore = await rollupOf(gasId, "2026-02-01");
    await db.insert(schema.monthCloses).values({
      organizationId: org.org.id,
      month: "2026-02-01",
    });
    const changed = await manager.postJson(cvPath(), {
      period: "2026-02",
      calorific_value_mj_m3: 40.0,
      source: "Corrected bill",
    });
    expect(changed.status).toBe(201);
    // Only the 11th took February's monthly value: the 10th has its own,
    // and the 12th's reading brought its CV.
    expect(await changed.json()).toMatchObject({ intervals_repriced: 1 });
    const feb = (await intervalsOf(gasId)).filter((i) =>
      i.start.startsWith("2026-02"),
    );
    expect(feb.map((i) => i.energyKwh)).toEqual([
      kwh(10, 38.8),
      kwh(10, 40.0),
      kwh(10, 41),
    ]);
    const delta = (Number(kwh(10, 40.0)) - Number(kwh(10, 39.5))).toFixed(6);
    const adjustments = await db
      .select({
        month: schema.ledgerAdjustments.month,
        deltaKwh: schema.ledgerAdjustments.deltaKwh,
        source: schema.ledgerAdjustments.source,
        reason: schema.ledgerAdjustments.reason,
      })
      .from(schema.ledgerAdjustments)
      .where(
        and(
          eq(schema.ledgerAdjustments.organizationId, org.org.id),
          eq(schema.ledgerAdjustments.meterId, gasId),
        ),
      );
    expect(adjustments).toEqual([
      {
        month: "2026-02-01",
        deltaKwh: delta,
        source: "calorific_value",
        reason: expect.stringContaining("2026-02: 40 MJ/m³ gross"),
      },
    ]);
    expect(
      (Number(await rollupOf(gasId, "2026-02-01")) - Number(febBefore)).toFixed(
        6,
      ),
    ).toBe(delta);
    const audit = await db
      .select({
        action: schema.auditLog.action,
        before: schema.auditLog.before,
      })
      .from(schema.auditLog)
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.meterId, gasId),
        ),
      );
    expect(audit).toEqual(
      expect.arrayContaining([
        {
          action: "gas.cv_saved",
          before: { calorificValueMjM3: "39.5", basis: "gross" },
        },
        expect.objectContaining({ action: "ledger.adjusted" }),
      ]),
    );
  });

  it("removes only a value no reading has used", async () => {
    const used = await manager.request(`${cvPath()}/2026-02-10`, {
      method: "DELETE",
    });
    expect(used.status).toBe(409);
    await manager.postJson(cvPath(), {
      period: "2026-06",
      calorific_value_mj_m3: 39.2,
    });
    const unused = await manager.request(`${cvPath()}/2026-06`, {
      method: "DELETE",
    });
    expect(unused.status).toBe(204);
    const periods = (
      (await (await auditor.get(cvPath())).json()) as {
        calorific_values: { period: string }[];
      }
    ).calorific_values.map((c) => c.period);
    expect(periods).toEqual(["2026-01", "2026-02", "2026-02-10"]);
  });
});

describe("a gas register in hundreds of cubic feet", () => {
  it("turns reads (multiplier, roll-over) into interval volumes priced by each day's CV", async () => {
    const code = `GR-${org.tag}`;
    const created = await manager.postJson(`${base}/meters`, {
      site_id: org.siteId,
      code,
      name: "Imperial gas register",
      quantity: "gas_volume",
      carrier: "natural_gas",
      orientation: "import",
      interval_minutes: 60,
      multiplier: 10,
      rollover_kwh: 10000,
      installed_at: "2020-01-01",
    });
    expect(created.status).toBe(201);
    const meterId = ((await created.json()) as Json).id as string;
    const settings = await manager.postJson(
      `${base}/meters/${meterId}/gas-settings`,
      { register_unit: "hcf", gas_temp_c: 10, gas_pressure_mbar_g: 21 },
    );
    expect(settings.status).toBe(200);
    const correction = ((await settings.json()) as Json)
      .effective_correction_factor as number;
    expect(correction).toBeCloseTo(
      ((1013.25 + 21) / 1013.25) * (288.15 / 283.15),
      12,
    );
    const cv = await manager.postJson(
      `/api/v1/orgs/${org.org.id}/meters/${meterId}/calorific-values`,
      { period: "2026-01", calorific_value_mj_m3: 39.3 },
    );
    expect(cv.status).toBe(201);

    const reads = (time: string, hcf: number) => ({
      meter: code,
      quantity: "gas_register",
      time,
      register_hcf: hcf,
    });
    const answer = await postReadings([
      reads("2026-01-20T08:00:00Z", 9990),
      // Rolled over: 10 to 10000, then 5 more: 15 hcf in two hours.
      reads("2026-01-20T10:00:00Z", 5),
      {
        ...reads("2026-01-20T11:00:00Z", 6),
        register_hcf: undefined,
        register_m3: 6,
      },
      reads("2026-01-20T12:00:00Z", 10000),
    ]);
    expect(answer.accepted).toBe(2);
    expect(answer.rejected.map((r) => r.reason)).toEqual([
      expect.stringContaining("reads in hcf; send register_hcf"),
      expect.stringContaining("not below the register's roll-over point 10000"),
    ]);
    // 15 hcf × 10 (multiplier) × 2.8316846592 m³ × correction, split evenly.
    const perHour = (15 * 10 * 2.8316846592 * correction) / 2;
    const rows = await intervalsOf(meterId);
    expect(rows.map((r) => r.start)).toEqual([
      "2026-01-20T08:00:00.000Z",
      "2026-01-20T09:00:00.000Z",
    ]);
    for (const row of rows) {
      expect(Number(row.energyKwh)).toBeCloseTo((perHour * 39.3) / 3.6, 5);
    }
    expect(rows[1].flags).toContain("rollover");
  });
});
