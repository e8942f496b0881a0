/**
 * How ingest and the reads scale with the number of monthly partitions and
 * of organisations in one PostgreSQL (docs/scaling.md has the figures):
 *
 *   partitions  one organisation, its intervals and rollups filled for every
 *               month of 12, 60 and 120 monthly partitions of intervals and
 *               raw_readings
 *   orgs        at the largest partition count, 1, 100 and 1,000
 *               organisations, each with meters, a year of rollups and a
 *               week of intervals
 *
 * At each point, the measured organisation's:
 *   ingest   ingestReadings (the whole write path of POST /readings, in
 *            process: checks, raw readings, intervals, rollups, COMMIT) of
 *            batches of 400 register readings (4 fresh meters × 100 hours)
 *   ledger   ledgerRows for a year (the Ledger API's read)
 *   week     listIntervals of one meter for a week (the readings view)
 * each the median of several runs.
 *
 * PGOPTIONS applies to every connection (e.g. "-c plan_cache_mode=force_custom_plan").
 * Database: a fresh `joulebook_scaling` in the managed cluster (or
 * SCALING_DATABASE_URL, which must be an empty database), dropped at the end.
 */
import path from "node:path";
import { performance } from "node:perf_hooks";
import { fileURLToPath } from "node:url";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { managedUrl } from "./readings.bench";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const DATABASE = "joulebook_scaling";
/** SCALING_PARTITIONS=12,120 and SCALING_ORGS=1,100 measure fewer points. */
const steps = (variable: string, fallback: number[]) =>
  process.env[variable]?.split(",").map(Number) ?? fallback;
const PARTITION_STEPS = steps("SCALING_PARTITIONS", [12, 60, 120]);
const ORG_STEPS = steps("SCALING_ORGS", [1, 100, 1000]);
const METERS_PER_ORG = 4;
/** The newest month with data; partitions reach back from it. */
const LAST_MONTH = Date.UTC(2026, 11, 1);
const INGEST_RUNS = 5;
const READ_RUNS = 9;
const HOURS_PER_BATCH = 100;
const HOUR_MS = 3_600_000;

const median = (values: number[]) =>
  [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

async function timeRuns(
  runs: number,
  fn: (run: number) => Promise<unknown>,
): Promise<number> {
  await fn(-1); // warm-up
  const samples: number[] = [];
  for (let run = 0; run < runs; run++) {
    const t = performance.now();
    await fn(run);
    samples.push(performance.now() - t);
  }
  return median(samples);
}

const monthStart = (monthsBack: number) => {
  const d = new Date(LAST_MONTH);
  d.setUTCMonth(d.getUTCMonth() - monthsBack);
  return d;
};

async function freshDatabase(): Promise<{
  url: string;
  drop: () => Promise<void>;
}> {
  if (process.env.SCALING_DATABASE_URL)
    return { url: process.env.SCALING_DATABASE_URL, drop: async () => {} };
  const admin = new pg.Client({ connectionString: managedUrl("postgres") });
  await admin.connect();
  await admin.query(`drop database if exists ${DATABASE} with (force)`);
  await admin.query(`create database ${DATABASE}`);
  await admin.end();
  return {
    url: managedUrl(DATABASE),
    async drop() {
      const again = new pg.Client({ connectionString: managedUrl("postgres") });
      await again.connect();
      await again.query(`drop database if exists ${DATABASE} with (force)`);
      await again.end();
    },
  };
}

/** An organisation with a site and `meters` electricity register meters. */
async function addOrganization(
  pool: pg.Pool,
  name: string,
  codePrefix: string,
  meters = METERS_PER_ORG,
): Promise<string> {
  const { rows } = await pool.query<{ id: string }>(
    "insert into organizations (name) values ($1) returning id",
    [name],
  );
  const org = rows[0].id;
  await pool.query(
    `insert into sites (organization_id, name, time_zone) values ($1, 'Site', 'UTC')`,
    [org],
  );
  await addMeters(pool, org, codePrefix, meters);
  return org;
}

async function addMeters(
  pool: pg.Pool,
  org: string,
  codePrefix: string,
  count: number,
): Promise<void> {
  await pool.query(
    `insert into meters (organization_id, site_id, code, name, quantity, carrier, orientation, installed_at)
     select $1, s.id, $2 || g, 'Meter ' || g, 'electric_register', 'electricity', 'import', '2000-01-01'
       from generate_series(1, $3::int) g, sites s where s.organization_id = $1`,
    [org, codePrefix, count],
  );
}

/**
 * Hourly intervals of the meters whose code starts with `codePrefix`, for
 * [from, to), and the monthly rollups that sum them.
 */
async function fill(
  pool: pg.Pool,
  orgs: string[],
  codePrefix: string,
  from: Date,
  to: Date,
): Promise<void> {
  await pool.query(
    `insert into intervals (organization_id, meter_id, interval_start, energy_kwh, quality)
     select m.organization_id, m.id, h, round((1 + random() * 10)::numeric, 6), 'measured'
       from meters m, generate_series($3::timestamptz, $4::timestamptz - interval '1 hour', interval '1 hour') h
      where m.organization_id = any($1::uuid[]) and m.code like $2 || '%'`,
    [orgs, codePrefix, from, to],
  );
  await pool.query(
    `insert into monthly_rollups (organization_id, meter_id, month, energy_kwh, estimated_kwh, hours, estimated_hours)
     select i.organization_id, i.meter_id, date_trunc('month', i.interval_start at time zone 'UTC')::date,
            sum(i.energy_kwh), 0, count(*), 0
       from intervals i join meters m on m.organization_id = i.organization_id and m.id = i.meter_id
      where i.organization_id = any($1::uuid[]) and m.code like $2 || '%'
        and i.interval_start >= $3 and i.interval_start < $4
      group by 1, 2, 3`,
    [orgs, codePrefix, from, to],
  );
}

/** A tenant's last week of intervals and a year of rollups (not their sum: only the sizes matter here). */
async function fillTenants(pool: pg.Pool, orgs: string[]): Promise<void> {
  const weekStart = new Date(monthStart(-1).getTime() - 7 * 24 * HOUR_MS);
  await pool.query(
    `insert into intervals (organization_id, meter_id, interval_start, energy_kwh, quality)
     select m.organization_id, m.id, h, round((1 + random() * 10)::numeric, 6), 'measured'
       from meters m, generate_series($2::timestamptz, $3::timestamptz - interval '1 hour', interval '1 hour') h
      where m.organization_id = any($1::uuid[])`,
    [orgs, weekStart, monthStart(-1)],
  );
  await pool.query(
    `insert into monthly_rollups (organization_id, meter_id, month, energy_kwh, estimated_kwh, hours, estimated_hours)
     select m.organization_id, m.id, (date '2026-01-01' + k * interval '1 month')::date,
            round((random() * 7000)::numeric, 6), 0, 720, 0
       from meters m, generate_series(0, 11) k
      where m.organization_id = any($1::uuid[])`,
    [orgs],
  );
}

async function partitionCount(pool: pg.Pool): Promise<number> {
  const { rows } = await pool.query<{ n: number }>(
    "select count(*)::int as n from pg_inherits where inhparent = 'intervals'::regclass",
  );
  return rows[0].n;
}

async function rowCounts(pool: pg.Pool) {
  const { rows } = await pool.query<{ intervals: string; rollups: string }>(
    `select (select count(*) from intervals) as intervals,
            (select count(*) from monthly_rollups) as rollups`,
  );
  return {
    intervals: Number(rows[0].intervals),
    rollups: Number(rows[0].rollups),
  };
}

const fmt = (n: number) => n.toLocaleString("en-GB");

export async function benchScaling(): Promise<void> {
  const database = await freshDatabase();
  console.log(`database: ${database.url.replace(/:[^:@/]*@/, ":…@")}`);
  const setup = new pg.Pool({ connectionString: database.url, max: 1 });
  await migrate(drizzle(setup), {
    migrationsFolder: path.join(ROOT, "drizzle"),
  });
  process.env.DATABASE_URL = database.url;
  // No mail or billing is sent; dead local addresses satisfy the check.
  process.env.RESEND_BASE_URL ??= "http://127.0.0.1:9";
  if (!process.env.STRIPE_SECRET_KEY)
    process.env.STRIPE_API_BASE ??= "http://127.0.0.1:9";
  const { ingestReadings } =
    await import("../app/ingest/ingest-readings.server");
  const { estimationIdle } = await import("../app/ingest/after-ingest.server");
  const { ledgerRows } = await import("../app/ledger/ledger-rows.server");
  const { listIntervals } = await import("../app/ingest/list-intervals.server");
  const { pool: appPool } = await import("../app/db/client.server");

  const measured = await addOrganization(setup, "Measured", "M-");
  const { rows: meterRows } = await setup.query<{ id: string }>(
    "select id from meters where organization_id = $1 order by code limit 1",
    [measured],
  );
  const weekMeter = meterRows[0].id;
  let point = 0;

  async function measure(label: string): Promise<string[]> {
    await setup.query("analyze");
    // Fresh meters per point, so each batch writes new hours.
    const prefix = `I${point++}-`;
    await addMeters(setup, measured, prefix, METERS_PER_ORG);
    const batch = (run: number) =>
      Array.from({ length: METERS_PER_ORG * HOURS_PER_BATCH }, (_, i) => {
        const meter = 1 + (i % METERS_PER_ORG);
        const hour =
          (run + 1) * HOURS_PER_BATCH + Math.floor(i / METERS_PER_ORG);
        return {
          meter: `${prefix}${meter}`,
          quantity: "electric_register",
          time: new Date(
            monthStart(11).getTime() + hour * HOUR_MS,
          ).toISOString(),
          register_kwh: 1000 + hour * 2.5,
        };
      });
    const ingestMs = await timeRuns(INGEST_RUNS, async (run) => {
      const result = await ingestReadings({
        organizationId: measured,
        source: "seed",
        readings: batch(run),
      });
      if (result.accepted !== METERS_PER_ORG * HOURS_PER_BATCH)
        throw new Error(`ingest accepted ${result.accepted}`);
      await estimationIdle();
    });
    const year = { from: "2026-01", to: "2026-12" };
    const ledgerMs = await timeRuns(READ_RUNS, () =>
      ledgerRows({ organizationId: measured, ...year }),
    );
    const weekFrom = new Date(monthStart(0).getTime() + 7 * 24 * HOUR_MS);
    const weekMs = await timeRuns(READ_RUNS, () =>
      listIntervals({
        organizationId: measured,
        meterId: weekMeter,
        from: weekFrom,
        to: new Date(weekFrom.getTime() + 7 * 24 * HOUR_MS),
      }),
    );
    const counts = await rowCounts(setup);
    const readingsPerSecond =
      (METERS_PER_ORG * HOURS_PER_BATCH) / (ingestMs / 1000);
    const row = [
      label,
      String(await partitionCount(setup)),
      fmt(counts.intervals),
      fmt(counts.rollups),
      `${ingestMs.toFixed(0)} ms (${fmt(Math.round(readingsPerSecond))}/s)`,
      `${ledgerMs.toFixed(1)} ms`,
      `${weekMs.toFixed(1)} ms`,
    ];
    console.log(row.join(" | "));
    return row;
  }

  const results: string[][] = [];
  const header = [
    "point",
    "partitions",
    "intervals",
    "rollups",
    "ingest 400 readings",
    "ledger, a year",
    "intervals, a week",
  ];
  console.log(header.join(" | "));
  try {
    // Partitions: one organisation, every month filled.
    let filledMonths = 0;
    for (const months of PARTITION_STEPS) {
      await setup.query("select ensure_month_partitions($1, $2)", [
        monthStart(months - 1),
        monthStart(0),
      ]);
      await fill(
        setup,
        [measured],
        "M-",
        monthStart(months - 1),
        monthStart(filledMonths - 1),
      );
      filledMonths = months;
      results.push(await measure(`1 org, ${months} months`));
    }
    // Organisations: the same partitions, more tenants beside the measured one.
    let orgs = 1;
    for (const target of ORG_STEPS.slice(1)) {
      const added: string[] = [];
      for (; orgs < target; orgs++) {
        added.push(await addOrganization(setup, `Tenant ${orgs}`, `T${orgs}-`));
      }
      await fillTenants(setup, added);
      results.push(
        await measure(`${target} orgs, ${PARTITION_STEPS.at(-1)} months`),
      );
    }
  } finally {
    await appPool.end();
    await setup.end();
    await database.drop();
  }
  console.log("\n| " + header.join(" | ") + " |");
  console.log("| " + header.map(() => "---").join(" | ") + " |");
  for (const row of results) console.log("| " + row.join(" | ") + " |");
}
