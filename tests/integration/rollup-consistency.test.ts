/**
 * Monthly rollups against their hours, after a seeded random mix of what
 * happens to a meter: concurrent batches on the same meters and months,
 * hours split over several readings and readings over several hours,
 * repeats and conflicts, register reads out of order (late reads between
 * others re-split stored hours, a roll-over), gaps that estimation fills and
 * late data that replaces the estimates, edits, and a month closed before
 * late data and an edit arrive in it.
 *
 * Every rollup must equal the numeric sum of its hours to the last digit, in
 * every column, at any moment; and a closed month's adjusting entries must
 * add up exactly to what changed in it after the close. The heat meter's
 * monthly exergy, which ingest moves by differences, must equal its full
 * recompute (app/exergy) to the last digit too.
 */
import { drizzle } from "drizzle-orm/node-postgres";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { recomputeMeters } from "../../app/exergy/exergy-store.server";
import { Client } from "../support/http";
import { pool } from "../support/db";
import { estimationSettled } from "../support/estimation";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

/** Each seed is its own organisation and mix; a failure names its seed. */
const SEEDS = (process.env.ROLLUP_SEEDS ?? "20260331,7").split(",").map(Number);
const HOUR_MS = 3_600_000;
/** Europe/London: summer time from 01:00Z on 29 March; April from 23:00Z on 31 March. */
const T0 = Date.parse("2026-03-28T00:00:00Z");
const HOURS = 144;
const CONCURRENT = 4;

type Reading = Record<string, unknown>;

interface Answer {
  accepted: number;
  repeats: number;
  rejected: unknown[];
  conflicts: unknown[];
}

/** mulberry32: a seeded stream, so a failure replays the same mix. */
function random(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const iso = (ms: number) => new Date(ms).toISOString();

function water(
  org: MeteredOrg,
  from: number,
  minutes: number,
  next: () => number,
) {
  return {
    meter: org.meters.water.code,
    quantity: "water_heat",
    start: iso(from),
    end: iso(from + minutes * 60_000),
    volume_m3: Math.round((0.2 + next() * 2.5) * (minutes / 60) * 1000) / 1000,
    flow_temp_c: 60 + Math.floor(next() * 20),
    return_temp_c: 35 + Math.floor(next() * 15),
  };
}

/** One hour's readings: whole, halves, a two-hour reading, or odd splits. */
function waterHour(org: MeteredOrg, h: number, next: () => number) {
  const t = T0 + h * HOUR_MS;
  const pick = next();
  if (pick < 0.15)
    return {
      hours: 1,
      readings: [water(org, t, 30, next), water(org, t + 1_800_000, 30, next)],
    };
  if (pick < 0.25 && h + 1 < HOURS)
    return { hours: 2, readings: [water(org, t, 120, next)] };
  if (pick < 0.32 && h + 1 < HOURS)
    return {
      hours: 2,
      readings: [
        water(org, t, 20, next),
        water(org, t + 1_200_000, 80, next),
        water(org, t + 6_000_000, 20, next),
      ],
    };
  return { hours: 1, readings: [water(org, t, 60, next)] };
}

/** The heat meter's readings; some hours held back as gaps, to come late. */
function waterReadings(org: MeteredOrg, next: () => number) {
  const now: Reading[] = [];
  const late: Reading[] = [];
  for (let h = 0; h < HOURS;) {
    const hour = waterHour(org, h, next);
    (next() < 0.08 ? late : now).push(...hour.readings);
    h += hour.hours;
  }
  return { now, late };
}

/** Register reads every 40–120 minutes through a roll-over; some come late. */
function registerReadings(org: MeteredOrg, next: () => number) {
  const now: Reading[] = [];
  const late: Reading[] = [];
  let value = 99_000;
  for (
    let t = T0;
    t < T0 + HOURS * HOUR_MS;
    t += (40 + Math.floor(next() * 80)) * 60_000
  ) {
    value = Math.round((value + next() * 30) * 1000) / 1000;
    const read = {
      meter: org.meters.register.code,
      quantity: "electric_register",
      time: iso(t),
      register_kwh:
        value >= 100_000 ? Math.round((value - 100_000) * 1000) / 1000 : value,
    };
    (next() < 0.12 && t > T0 ? late : now).push(read);
  }
  return { now, late };
}

function shuffle<T>(items: T[], next: () => number): T[] {
  const out = [...items];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(next() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** Batches of 20–70 readings, with some readings sent again, some changed. */
function batches(readings: Reading[], next: () => number): Reading[][] {
  const again = readings.filter(() => next() < 0.06);
  const changed = readings
    .filter((r) => r.quantity === "water_heat" && next() < 0.03)
    .map((r) => ({ ...r, volume_m3: 9.999 }));
  const all = shuffle([...readings, ...again, ...changed], next);
  const out: Reading[][] = [];
  for (let i = 0; i < all.length;) {
    const size = 20 + Math.floor(next() * 50);
    out.push(all.slice(i, i + size));
    i += size;
  }
  return out;
}

afterAll(() => pool.end());

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function postAll(org: MeteredOrg, list: Reading[][], pause = 0) {
  const answers: Answer[] = [];
  for (let i = 0; i < list.length; i += CONCURRENT) {
    const wave = list.slice(i, i + CONCURRENT).map(async (readings) => {
      const response = await new Client().postJson(
        "/api/v1/readings",
        { readings },
        { authorization: `Bearer ${org.gatewayKey}` },
      );
      expect(response.status).toBe(200);
      return (await response.json()) as Answer;
    });
    answers.push(...(await Promise.all(wave)));
    // Lets the server's estimation run between some waves, racing the next.
    if (pause) await sleep(pause);
  }
  for (const a of answers) expect(a.rejected).toEqual([]);
  return answers;
}

/** Every meter-month whose rollup differs from the sum of its hours, in one snapshot. */
async function mismatches(org: MeteredOrg) {
  const { rows } = await pool.query(
    `with hours as (
       select i.meter_id, (date_trunc('month', i.interval_start at time zone s.time_zone))::date as month,
              sum(i.energy_kwh) as energy_kwh,
              coalesce(sum(i.energy_kwh) filter (where i.quality = 'estimated'), 0) as estimated_kwh,
              sum(i.uncertainty_kwh) as uncertainty_kwh,
              count(*)::int as hours,
              (count(*) filter (where i.quality = 'estimated'))::int as estimated_hours
         from intervals i
         join meters m on m.organization_id = i.organization_id and m.id = i.meter_id
         join sites s on s.organization_id = m.organization_id and s.id = m.site_id
        where i.organization_id = $1
        group by 1, 2
     ), rollups as (
       select meter_id, month, energy_kwh, estimated_kwh, uncertainty_kwh, hours, estimated_hours
         from monthly_rollups where organization_id = $1
     )
     select meter_id, to_char(month, 'YYYY-MM') as month,
            h.energy_kwh::text as hours_kwh, r.energy_kwh::text as rollup_kwh,
            h.estimated_kwh::text as hours_estimated, r.estimated_kwh::text as rollup_estimated,
            h.uncertainty_kwh::text as hours_band, r.uncertainty_kwh::text as rollup_band,
            h.hours, r.hours as rollup_hours, h.estimated_hours, r.estimated_hours as rollup_estimated_hours
       from hours h full join rollups r using (meter_id, month)
      where h.energy_kwh is distinct from r.energy_kwh
         or h.estimated_kwh is distinct from r.estimated_kwh
         or h.uncertainty_kwh is distinct from r.uncertainty_kwh
         or h.hours is distinct from r.hours
         or h.estimated_hours is distinct from r.estimated_hours`,
    [org.org.id],
  );
  return rows;
}

/**
 * The site's outdoor means over the readings' days: mild, cold, and one
 * day warmer than some heating flows, on which those hours give no exergy.
 */
const WEATHER: [string, string][] = [
  ["2026-03-28", "8.25"],
  ["2026-03-29", "3.50"],
  ["2026-03-30", "67.00"],
  ["2026-03-31", "11.75"],
  ["2026-04-01", "-2.25"],
  ["2026-04-02", "9.00"],
  ["2026-04-03", "5.50"],
];

async function addWeather(org: MeteredOrg) {
  await pool.query(
    `insert into daily_weather (organization_id, site_id, day, mean_temp_c, source)
     select $1, $2, d, t, 'upload' from unnest($3::date[], $4::numeric[]) as u(d, t)`,
    [
      org.org.id,
      org.siteId,
      WEATHER.map(([d]) => d),
      WEATHER.map(([, t]) => t),
    ],
  );
}

type ExergyMonth = { month: string; exact: string; kwh: string; n: number };

/**
 * The heat meter's monthly exergy as stored, beside what a full recompute
 * gives (in a transaction rolled back, so nothing changes): equal, or the
 * difference-keeping in ingest has drifted.
 */
async function exergyAgainstRecompute(org: MeteredOrg) {
  const client = await pool.connect();
  const read = async () =>
    (
      await client.query<ExergyMonth>(
        `select to_char(month, 'YYYY-MM') as month, exergy_exact_kwh::text as exact,
                exergy_kwh::text as kwh, intervals as n
           from monthly_exergy where organization_id = $1 and meter_id = $2 order by month`,
        [org.org.id, org.meters.water.id],
      )
    ).rows;
  try {
    await client.query("begin");
    const stored = await read();
    await recomputeMeters(drizzle(client), org.org.id, {
      meterIds: [org.meters.water.id],
      from: new Date(T0),
      to: new Date(T0 + HOURS * HOUR_MS),
    });
    return { stored, recomputed: await read() };
  } finally {
    await client.query("rollback");
    client.release();
  }
}

async function expectExergyExact(org: MeteredOrg) {
  const { stored, recomputed } = await exergyAgainstRecompute(org);
  expect(stored).toEqual(recomputed);
  // Both months, each with intervals counted (not a trivial zero).
  expect(stored.map((m) => m.month)).toEqual(["2026-03", "2026-04"]);
  for (const m of stored) expect(m.n).toBeGreaterThan(0);
}

async function marchRollups(org: MeteredOrg) {
  const { rows } = await pool.query<{ meter_id: string; energy_kwh: string }>(
    `select meter_id, energy_kwh::text from monthly_rollups
      where organization_id = $1 and month = '2026-03-01' order by meter_id`,
    [org.org.id],
  );
  return rows;
}

/** Per meter: March now, less its adjusting entries since the close, against March at the close. */
async function closedMonthDrift(
  org: MeteredOrg,
  atClose: { meter_id: string; energy_kwh: string }[],
) {
  const { rows } = await pool.query(
    `select r.meter_id, r.energy_kwh::text as now_kwh, c.at_close::text,
            coalesce(a.delta, 0)::text as adjusted_kwh, coalesce(a.n, 0)::int as entries
       from monthly_rollups r
       join unnest($2::uuid[], $3::numeric[]) as c(meter_id, at_close) on c.meter_id = r.meter_id
       left join lateral (
         select sum(delta_kwh) as delta, count(*) as n from ledger_adjustments
          where organization_id = $1 and meter_id = r.meter_id and month = r.month
       ) a on true
      where r.organization_id = $1 and r.month = '2026-03-01'`,
    [
      org.org.id,
      atClose.map((r) => r.meter_id),
      atClose.map((r) => r.energy_kwh),
    ],
  );
  return rows as {
    meter_id: string;
    now_kwh: string;
    at_close: string;
    adjusted_kwh: string;
    entries: number;
  }[];
}

async function edit(
  manager: Client,
  org: MeteredOrg,
  meterId: string,
  hour: number,
  kwh: number,
) {
  const response = await manager.post(
    `/o/${org.org.id}/meters/${meterId}/readings`,
    {
      intent: "edit",
      intervalStart: iso(T0 + hour * HOUR_MS),
      energyKwh: String(kwh),
      reason: "Checked against the site log",
    },
  );
  expect(response.status).toBe(200);
}

describe.each(SEEDS)(
  "monthly rollups under a random mix of concurrent writes (seed %i)",
  (seed) => {
    let org: MeteredOrg;
    let manager: Client;
    const next = random(seed);

    beforeAll(async () => {
      org = await createMeteredOrg({ roles: ["energy_manager"] });
      await addWeather(org);
      manager = new Client();
      await manager.signIn(
        org.org.members[0].email,
        org.org.members[0].password,
      );
    });

    it("every rollup equals the sum of its hours, and a closed month's entries add up", async () => {
      const heat = waterReadings(org, next);
      const register = registerReadings(org, next);

      // Concurrent batches on the same meters and months, estimation between.
      const answers = await postAll(
        org,
        batches([...heat.now, ...register.now], next),
        150,
      );
      expect(await mismatches(org)).toEqual([]);
      await expectExergyExact(org);
      await estimationSettled(org.org.id);
      const { rows: estimated } = await pool.query(
        `select 1 from intervals where organization_id = $1 and meter_id = $2 and quality = 'estimated'`,
        [org.org.id, org.meters.water.id],
      );
      expect(estimated.length).toBeGreaterThan(0);

      // Edits in April, while more (repeated, changed) batches arrive.
      const [, , more] = await Promise.all([
        edit(manager, org, org.meters.water.id, 100, 42.5),
        edit(manager, org, org.meters.register.id, 110, 7.25),
        postAll(org, batches(shuffle(heat.now, next).slice(0, 60), next)),
      ]);
      answers.push(...more);
      expect(await mismatches(org)).toEqual([]);
      await expectExergyExact(org);
      await estimationSettled(org.org.id);

      // March closes; then late data and an edit arrive in it (and in April).
      const close = await manager.post(`/o/${org.org.id}/ledger`, {
        intent: "close",
        month: "2026-03",
        siteId: "",
      });
      expect(close.status).toBe(200);
      const atClose = await marchRollups(org);
      const [late] = await Promise.all([
        postAll(org, batches([...heat.late, ...register.late], next), 100),
        edit(manager, org, org.meters.water.id, 30, 0.125),
      ]);
      answers.push(...late);
      expect(await mismatches(org)).toEqual([]);
      await expectExergyExact(org);
      await estimationSettled(org.org.id);

      expect(await mismatches(org)).toEqual([]);
      const { rows: marked } = await pool.query(
        `select 1 from intervals where organization_id = $1 and updated_at = '-infinity'`,
        [org.org.id],
      );
      expect(marked).toEqual([]);
      const drift = await closedMonthDrift(org, atClose);
      expect(drift.length).toBe(atClose.length);
      for (const d of drift) {
        const { rows } = await pool.query<{ ok: boolean }>(
          "select $1::numeric - $2::numeric = $3::numeric as ok",
          [d.now_kwh, d.adjusted_kwh, d.at_close],
        );
        expect(rows[0].ok, JSON.stringify(d)).toBe(true);
      }
      expect(drift.some((d) => d.entries > 0)).toBe(true);

      // Each distinct reading stored once, whatever was sent twice or changed.
      const keys = new Set(
        [...heat.now, ...heat.late, ...register.now, ...register.late].map(
          (r) => `${r.meter}|${r.start ?? r.time}`,
        ),
      );
      const { rows: raw } = await pool.query<{ n: number }>(
        "select count(*)::int as n from raw_readings where organization_id = $1",
        [org.org.id],
      );
      expect(raw[0].n).toBe(keys.size);
      expect(answers.reduce((n, a) => n + a.accepted, 0)).toBe(keys.size);
      expect(answers.some((a) => a.repeats > 0)).toBe(true);
      expect(answers.some((a) => a.conflicts.length > 0)).toBe(true);
    });
  },
);
