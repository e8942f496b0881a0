/**
 * The demo estate's own readings, through the gateway API into a fresh
 * organisation: every site-local month of every meter must equal the exact
 * numeric sum of its hours, in the rollups and in the ledger API.
 */
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { gatewayKeyPrefix } from "../../app/auth/gateway-keys.server";
import { hashToken } from "../../app/auth/tokens.server";
import { MAX_READINGS_PER_BATCH } from "../../app/ingest/reading-schema";
import { generateReadings } from "../../seeds/scenario/generate";
import {
  SCENARIO_GAPS,
  SCENARIO_PERIOD,
} from "../../seeds/scenario/larchmere-estate";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";

/** About two months of the scenario: December 2024 and January 2025. */
const DAYS = 62;
const RANGE = {
  from: SCENARIO_PERIOD.from,
  to: new Date(SCENARIO_PERIOD.from.getTime() + DAYS * 86_400_000),
};
const MONTHS = ["2024-12", "2025-01"];

/** The app's own pool, opened by the seed module; closed with ours. */
let appPool: { end(): Promise<void> } | null = null;
afterAll(async () => {
  await pool.end();
  await appPool?.end();
});

let org: Awaited<ReturnType<typeof createOrganization>>;
let gatewayKey: string;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  // The seed module reads the app's environment when it loads, which wants
  // an e-mail endpoint: the suite's local fake (nothing is sent here).
  applyAppTestEnv();
  const [{ createEstate }, client] = await Promise.all([
    import("../../seeds/seed-estate"),
    import("../../app/db/client.server"),
  ]);
  appPool = client.pool;

  org = await createOrganization(["owner"]);
  // The demo estate's sites and meters, exactly as the seed makes them.
  expect(await createEstate(org.id)).toBe(true);
  gatewayKey = `jbgw_${randomBytes(32).toString("base64url")}`;
  await db.insert(schema.gateways).values({
    organizationId: org.id,
    name: "Demo months gateway",
    keyHash: hashToken(gatewayKey),
    keyPrefix: gatewayKeyPrefix(gatewayKey),
  });
});

async function postBatch(readings: unknown[]): Promise<void> {
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${gatewayKey}` },
  );
  const body = (await response.json()) as {
    accepted: number;
    rejected: unknown[];
    conflicts: unknown[];
  };
  expect(response.status, JSON.stringify(body).slice(0, 500)).toBe(200);
  expect(body.rejected).toEqual([]);
  expect(body.conflicts).toEqual([]);
  expect(body.accepted).toBe(readings.length);
}

/**
 * Estimates and flags are written after the answer and change intervals and
 * rollups: wait until the organisation's hours stop changing for a second.
 */
async function estimationSettled(organizationId: string): Promise<void> {
  const read = async () =>
    JSON.stringify(
      (
        await pool.query(
          "select sum(energy_kwh)::text as e, count(*)::int as n from intervals where organization_id = $1",
          [organizationId],
        )
      ).rows[0],
    );
  const deadline = Date.now() + 30_000;
  let previous = await read();
  for (;;) {
    await new Promise((r) => setTimeout(r, 1000));
    const current = await read();
    if (current === previous) return;
    if (Date.now() > deadline)
      throw new Error("estimation did not settle within 30 s");
    previous = current;
  }
}

type MeterMonth = {
  code: string;
  month: string;
  /** Exact numeric sum of the meter's hours in the month, as text. */
  hours_kwh: string | null;
  hours: number;
  rollup_kwh: string | null;
  rollup_hours: number | null;
};

describe("demo estate months", () => {
  it(
    "monthly totals equal the sum of their intervals for every demo month",
    { timeout: 90_000 },
    async () => {
      let batch: unknown[] = [];
      let posted = 0;
      for (const { reading } of generateReadings(RANGE)) {
        batch.push(reading);
        if (batch.length === MAX_READINGS_PER_BATCH) {
          await postBatch(batch);
          posted += batch.length;
          batch = [];
        }
      }
      if (batch.length > 0) {
        await postBatch(batch);
        posted += batch.length;
      }
      expect(posted).toBeGreaterThan(20_000);
      await estimationSettled(org.id);

      // Every meter and site-local month: the rollup against the exact sum
      // of the meter's hours in that month, in the site's zone.
      const { rows: zones } = await pool.query<{ time_zone: string }>(
        "select distinct time_zone from sites where organization_id = $1",
        [org.id],
      );
      expect(zones.map((z) => z.time_zone)).toEqual(["Europe/London"]);
      const { rows: months } = await pool.query<MeterMonth>(
        `with hours as (
           select i.meter_id,
                  date_trunc('month', i.interval_start at time zone s.time_zone)::date as month,
                  sum(i.energy_kwh) as kwh, count(*)::int as n
             from intervals i
             join meters m on m.organization_id = i.organization_id and m.id = i.meter_id
             join sites s on s.organization_id = m.organization_id and s.id = m.site_id
            where i.organization_id = $1
            group by 1, 2
         ), rollups as (
           select meter_id, month, energy_kwh, hours
             from monthly_rollups where organization_id = $1
         )
         select m.code, to_char(coalesce(h.month, r.month), 'YYYY-MM') as month,
                h.kwh::text as hours_kwh, coalesce(h.n, 0) as hours,
                r.energy_kwh::text as rollup_kwh, r.hours as rollup_hours
           from hours h
           full join rollups r on r.meter_id = h.meter_id and r.month = h.month
           join meters m on m.organization_id = $1 and m.id = coalesce(h.meter_id, r.meter_id)
          order by 1, 2`,
        [org.id],
      );
      // A month the rollups list without any hour must say so: 0 kWh from
      // 0 hours (the empty sum), never a figure of its own.
      const mismatches = months.filter(
        (r) =>
          r.rollup_kwh !== (r.hours_kwh ?? "0.000000") ||
          r.rollup_hours !== r.hours,
      );
      expect(mismatches).toEqual([]);
      const withHours = months.filter((r) => r.hours > 0);
      // The meters installed over the range (the school's replacement
      // meter comes later), each with both months.
      const { rows: installed } = await pool.query<{ code: string }>(
        `select code from meters where organization_id = $1
            and installed_at <= $2 and (removed_at is null or removed_at >= $3) order by code`,
        [org.id, RANGE.from, RANGE.to],
      );
      expect(installed.length).toBeGreaterThan(15);
      expect(withHours.map((r) => [r.code, r.month])).toEqual(
        installed.flatMap((m) => MONTHS.map((month) => [m.code, month])),
      );
      // Every hour of both months is there: the gateways' gaps estimated.
      expect(withHours.filter((r) => r.hours !== 31 * 24)).toEqual([]);
      const gapHours = SCENARIO_GAPS.filter(
        (g) =>
          Date.parse(g.start) >= RANGE.from.getTime() &&
          Date.parse(g.start) < RANGE.to.getTime(),
      ).reduce((sum, g) => sum + g.hours, 0);
      expect(gapHours).toBeGreaterThan(0);
      const { rows: estimated } = await pool.query<{ n: number }>(
        "select count(*)::int as n from intervals where organization_id = $1 and quality = 'estimated'",
        [org.id],
      );
      expect(estimated[0].n).toBe(gapHours);

      // The ledger API: per site, month and carrier, boundary meters only;
      // delivered ≥ 0 and exported ≤ 0 for every carrier.
      const { rows: boundary } = await pool.query<{
        site_id: string;
        month: string;
        carrier: string;
        imports_kwh: string;
        exports_kwh: string;
        net_kwh: string;
      }>(
        `select s.id as site_id,
                to_char(date_trunc('month', i.interval_start at time zone s.time_zone), 'YYYY-MM') as month,
                m.carrier::text as carrier,
                coalesce(sum(d.kwh) filter (where m.orientation = 'import'), 0)::text as imports_kwh,
                coalesce(sum(d.kwh) filter (where m.orientation = 'export'), 0)::text as exports_kwh,
                sum(d.kwh)::text as net_kwh
           from intervals i
           join meters m on m.organization_id = i.organization_id and m.id = i.meter_id
           join sites s on s.organization_id = m.organization_id and s.id = m.site_id
           -- Delivered view: chilled water's heat flow is cooling delivered.
           cross join lateral (select case when m.carrier = 'cooling' then -i.energy_kwh
                                           else i.energy_kwh end as kwh) d
          where i.organization_id = $1 and m.parent_meter_id is null and m.position = 'boundary'
          group by 1, 2, 3`,
        [org.id],
      );
      const owner = new Client();
      await owner.signIn(org.members[0].email, org.members[0].password);
      const response = await owner.get(
        `/api/v1/orgs/${org.id}/ledger?from=${MONTHS[0]}&to=${MONTHS.at(-1)}`,
      );
      expect(response.status).toBe(200);
      const ledger = (await response.json()) as {
        rows: {
          site_id: string;
          month: string;
          carrier: string;
          imports_kwh: string;
          exports_kwh: string;
          net_kwh: string;
          status: string;
        }[];
      };
      const key = (r: { site_id: string; month: string; carrier: string }) =>
        `${r.site_id}|${r.month}|${r.carrier}`;
      const figures = (r: (typeof boundary)[number]) => [
        key(r),
        r.imports_kwh,
        r.exports_kwh,
        r.net_kwh,
      ];
      const byKey = (a: string[], b: string[]) => a[0].localeCompare(b[0]);
      expect(ledger.rows.every((r) => r.status === "open")).toBe(true);
      for (const r of ledger.rows) {
        expect(Number(r.imports_kwh), key(r)).toBeGreaterThanOrEqual(0);
        expect(Number(r.exports_kwh), key(r)).toBeLessThanOrEqual(0);
      }
      expect(ledger.rows.map(figures).sort(byKey)).toEqual(
        boundary.map(figures).sort(byKey),
      );
      // Seven sites, two months, each with its carriers.
      expect(new Set(ledger.rows.map((r) => r.site_id)).size).toBe(7);
      expect(ledger.rows.length).toBeGreaterThanOrEqual(7 * 2 * 2);
    },
  );

  it(
    "the demo's illustrative tariffs and factors give every ledger row its cost and both carbon figures, and the totals are the rows' exact sums",
    { timeout: 90_000 },
    async () => {
      const { seedTariffs } = await import("../../seeds/seed-tariffs");
      await seedTariffs(org.id);
      const { seedCarbon } = await import("../../seeds/seed-carbon");
      await seedCarbon(org.id);
      const owner = new Client();
      await owner.signIn(org.members[0].email, org.members[0].password);
      const response = await owner.get(
        `/api/v1/orgs/${org.id}/ledger?from=${MONTHS[0]}&to=${MONTHS.at(-1)}`,
      );
      expect(response.status).toBe(200);
      const ledger = (await response.json()) as {
        rows: {
          carrier: string;
          cost: string | null;
          currency: string | null;
          co2e_kg: string | null;
          co2e_market_kg: string | null;
        }[];
        totals: {
          carrier: string;
          cost: string | null;
          currency: string | null;
          co2e_kg: string | null;
          co2e_market_kg: string | null;
        }[];
        cost_totals: { currency: string; cost: string }[];
        carbon_total: { co2e_kg: string; co2e_market_kg: string };
      };
      expect(ledger.rows.length).toBeGreaterThanOrEqual(7 * 2 * 2);
      expect(
        ledger.rows.filter(
          (r) =>
            r.cost === null ||
            r.currency !== "GBP" ||
            r.co2e_kg === null ||
            r.co2e_market_kg === null,
        ),
      ).toEqual([]);
      // Exact sums, in integer units of 10⁻¹² so no float rounds them.
      const units = (text: string) => {
        const [whole, fraction = ""] = text.replace("-", "").split(".");
        const value = BigInt(whole + fraction.padEnd(12, "0"));
        return text.startsWith("-") ? -value : value;
      };
      const sum = (texts: string[]) => texts.reduce((s, t) => s + units(t), 0n);
      expect(units(ledger.cost_totals[0].cost)).toBe(
        sum(ledger.rows.map((r) => r.cost!)),
      );
      expect(ledger.cost_totals.map((t) => t.currency)).toEqual(["GBP"]);
      for (const total of ledger.totals)
        expect(units(total.cost!), total.carrier).toBe(
          sum(
            ledger.rows
              .filter((r) => r.carrier === total.carrier)
              .map((r) => r.cost!),
          ),
        );
      // Carbon: per carrier and across carriers (kWh never are).
      for (const field of ["co2e_kg", "co2e_market_kg"] as const) {
        expect(units(ledger.carbon_total[field]), field).toBe(
          sum(ledger.rows.map((r) => r[field]!)),
        );
        for (const total of ledger.totals)
          expect(units(total[field]!), `${total.carrier} ${field}`).toBe(
            sum(
              ledger.rows
                .filter((r) => r.carrier === total.carrier)
                .map((r) => r[field]!),
            ),
          );
      }
    },
  );
});
