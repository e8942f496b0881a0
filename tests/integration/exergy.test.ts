/**
 * Exergy beside energy (app/exergy): heat and chilled-water readings with
 * flow and return temperatures, the site's daily weather as the dead state,
 * and the ledger API's `exergy_kwh`, which stays null ("no data") until every
 * interval of the month has its day's weather on the useful side of the flow,
 * and follows the weather when a day arrives or is replaced later.
 *
 * The expected figures are the evaluate API's own `details.exergy_kwh` for
 * each reading at its day's mean (water-exergy.ts, IF97 region 1), summed:
 * the ledger must give that sum to the micro-kWh it is stored in. A batch
 * whose day's mean changes while it runs must not keep a difference computed
 * at the old mean.
 */
import { drizzle } from "drizzle-orm/node-postgres";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  addReadingsExergy,
  applyReadingsExergy,
  recomputeMeters,
} from "../../app/exergy/exergy-store.server";
import type { PreparedReading } from "../../app/ingest/prepare-readings.server";
import { evaluateItem } from "../../app/physics/evaluate";
import { pool } from "../support/db";
import { Client } from "../support/http";
import {
  addCoolingMeter,
  createMeteredOrg,
  type MeteredOrg,
  type MeterRef,
} from "../support/metered-org";

afterAll(() => pool.end());

const HOUR = 3_600_000;

function water(
  code: string,
  start: string,
  hours: number,
  volume: number,
  flow: number,
  ret: number,
) {
  const from = Date.parse(start);
  return {
    meter: code,
    quantity: "water_heat",
    start: new Date(from).toISOString(),
    end: new Date(from + hours * HOUR).toISOString(),
    volume_m3: volume,
    flow_temp_c: flow,
    return_temp_c: ret,
  };
}

let org: MeteredOrg;
let cooling: MeterRef;
let manager: Client;
type Reading = ReturnType<typeof water>;
let heatReadings: Reading[];
let coolingReadings: Reading[];

/** Σ evaluate exergy of the readings, each at the mean of the day it starts on. */
function expectedExergy(
  readings: Reading[],
  pressureBarAbs: number,
  means: Record<string, number>,
): number {
  return readings.reduce((sum, { meter: _meter, ...r }) => {
    const result = evaluateItem({
      ...r,
      pressure_bar_abs: pressureBarAbs,
      sensor_at: "return",
      ambient_temp_c: means[r.start.slice(0, 10)],
    });
    if (!result.ok) throw new Error(result.error);
    return sum + (result.details.exergy_kwh as number);
  }, 0);
}

async function ledgerExergy(carrier: string): Promise<string | null> {
  const response = await manager.get(
    `/api/v1/orgs/${org.org.id}/ledger?from=2025-01&to=2025-01`,
  );
  expect(response.status).toBe(200);
  const body = (await response.json()) as {
    rows: { carrier: string; exergy_kwh: string | null }[];
  };
  const row = body.rows.find((r) => r.carrier === carrier);
  expect(row, carrier).toBeDefined();
  return row!.exergy_kwh;
}

function uploadWeather(days: [string, number][]) {
  const form = new FormData();
  form.set("intent", "upload-weather");
  form.set("siteId", org.siteId);
  const csv = ["date,mean_temp_c", ...days.map(([d, t]) => `${d},${t}`)];
  form.set(
    "file",
    new Blob([csv.join("\n")], { type: "text/csv" }),
    "weather.csv",
  );
  return manager.request(`/o/${org.org.id}/weather`, {
    method: "POST",
    body: form,
  });
}

function expectExergy(actual: string | null, expected: number) {
  expect(actual).toMatch(/^-?\d+\.\d{6}$/);
  expect(Math.abs(Number(actual) - expected)).toBeLessThanOrEqual(1e-6);
}

beforeAll(async () => {
  org = await createMeteredOrg({ roles: ["energy_manager"] });
  cooling = await addCoolingMeter(org);
  const w = org.meters.water.code;
  // Contiguous across midnight (January in London is UTC), so no gap is
  // estimated; the last reading covers two hours and is split.
  heatReadings = [
    water(w, "2025-01-15T22:00:00Z", 1, 2.0, 70, 50),
    water(w, "2025-01-15T23:00:00Z", 1, 2.5, 72, 51),
    water(w, "2025-01-16T00:00:00Z", 1, 1.5, 68, 49),
    water(w, "2025-01-16T01:00:00Z", 1, 1.75, 65, 47.5),
    water(w, "2025-01-16T02:00:00Z", 2, 3.0, 66, 48),
  ];
  coolingReadings = [
    water(cooling.code, "2025-01-15T23:00:00Z", 1, 4.0, 5, 11),
    water(cooling.code, "2025-01-16T00:00:00Z", 1, 3.5, 5.5, 11.5),
  ];
  const posted = await new Client().postJson(
    "/api/v1/readings",
    { readings: [...heatReadings, ...coolingReadings] },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(posted.status).toBe(200);
  expect(await posted.json()).toMatchObject({ accepted: 7, rejected: [] });
  manager = new Client();
  await manager.signIn(org.org.members[0].email, org.org.members[0].password);
});

describe("exergy beside energy in the ledger", () => {
  it("is null without weather, fills in as the days arrive, and follows a replaced day", async () => {
    // No weather yet: no dead state, no figure.
    expect(await ledgerExergy("heat")).toBeNull();
    expect(await ledgerExergy("cooling")).toBeNull();

    // One day of two: part of the month would pass for all of it.
    expect((await uploadWeather([["2025-01-15", 3.5]])).status).toBe(200);
    expect(await ledgerExergy("heat")).toBeNull();

    // Both days: the heat has its exergy; the chilled water on the 15th is
    // not colder than a 3.5 °C day, so cooling still has none.
    expect((await uploadWeather([["2025-01-16", 12.25]])).status).toBe(200);
    const heat = await ledgerExergy("heat");
    expectExergy(
      heat,
      expectedExergy(heatReadings, 6, {
        "2025-01-15": 3.5,
        "2025-01-16": 12.25,
      }),
    );
    expect(await ledgerExergy("cooling")).toBeNull();

    // The 15th replaced by a mild day above the chilled return: both rows
    // recomputed, and the cooling's exergy is whole.
    expect((await uploadWeather([["2025-01-15", 13.5]])).status).toBe(200);
    const means = { "2025-01-15": 13.5, "2025-01-16": 12.25 };
    const heatAfter = await ledgerExergy("heat");
    expectExergy(heatAfter, expectedExergy(heatReadings, 6, means));
    expect(Number(heatAfter)).toBeLessThan(Number(heat));
    const coolingExergy = await ledgerExergy("cooling");
    expectExergy(coolingExergy, expectedExergy(coolingReadings, 4, means));
    // Exergy of chilled water delivered enters the site, as its cooling does.
    expect(Number(coolingExergy)).toBeGreaterThan(0);

    // Six heat intervals (the two-hour reading split in two), all counted.
    const { rows } = await pool.query<{ intervals: number }>(
      `select intervals from monthly_exergy where organization_id = $1 and meter_id = $2`,
      [org.org.id, org.meters.water.id],
    );
    expect(rows).toEqual([{ intervals: 6 }]);

    // The interval-side rows sit in their month's partition, as intervals do
    // (migration 0024; docs/scaling.md).
    const { rows: homes } = await pool.query<{ home: string }>(
      `select distinct tableoid::regclass::text as home from interval_exergy
        where organization_id = $1 and meter_id = $2`,
      [org.org.id, org.meters.water.id],
    );
    expect(homes).toEqual([{ home: "interval_exergy_2025_01" }]);
  });

  it("a batch whose outdoor mean changes before it locks its month recomputes the month", async () => {
    const heat = org.meters.water;
    const hour = new Date("2025-01-15T22:00:00Z");
    // More heat into a stored interval, as a batch's water_heat reading adds it.
    const reading = {
      meter: { id: heat.id, intervalMinutes: 60 },
      readingTime: hour,
      endTime: new Date(hour.getTime() + HOUR),
      exergyBasis: {
        heatKwh: 7.5,
        entropyKwhPerK: 0.02,
        flowLimitC: 70,
        heating: true,
      },
    } as unknown as PreparedReading;
    const batch = await pool.connect();
    try {
      await batch.query("begin");
      const exergy = await addReadingsExergy(batch, org.org.id, [reading]);
      // Weather for that day commits (and recomputes the month) in between:
      // the batch's difference, computed at the old mean, no longer holds.
      expect((await uploadWeather([["2025-01-15", 1.5]])).status).toBe(200);
      await applyReadingsExergy(batch, org.org.id, exergy);
      await batch.query("commit");
    } finally {
      batch.release();
    }
    const read = async () =>
      (
        await pool.query(
          `select exergy_exact_kwh::text, exergy_kwh::text, intervals from monthly_exergy
            where organization_id = $1 and meter_id = $2`,
          [org.org.id, heat.id],
        )
      ).rows;
    const stored = await read();
    const check = await pool.connect();
    try {
      await check.query("begin");
      await recomputeMeters(drizzle(check), org.org.id, {
        meterIds: [heat.id],
        from: hour,
        to: hour,
      });
      const recomputed = (
        await check.query(
          `select exergy_exact_kwh::text, exergy_kwh::text, intervals from monthly_exergy
            where organization_id = $1 and meter_id = $2`,
          [org.org.id, heat.id],
        )
      ).rows;
      expect(stored).toEqual(recomputed);
    } finally {
      await check.query("rollback");
      check.release();
    }
  });
});
