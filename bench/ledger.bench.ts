/**
 * The ledger loader reads monthly rollups, never intervals, so its time must
 * not grow with the interval count. This bench builds 1,000 meters × 24
 * months of rollups, then measures the loader beside a bare SQL read of the
 * same rollup rows, first with 1M and then with 10M intervals in the table.
 */
import { performance } from "node:perf_hooks";
import pg from "pg";
import { benchDatabaseUrl } from "./readings.bench";

const METERS = 1000;
const SITES = 20;
const MONTHS = 24;
const FROM = "2024-12";
const TO = "2026-11";
const RUNS = 7;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

async function time(fn: () => Promise<unknown>): Promise<number> {
  await fn(); // warm-up
  const samples: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    await fn();
    samples.push(performance.now() - t);
  }
  return median(samples);
}

async function fixture(pool: pg.Pool): Promise<string> {
  const { rows } = await pool.query<{ id: string }>(
    "insert into organizations (name) values ($1) returning id",
    [`Ledger bench ${Date.now()}`],
  );
  const org = rows[0].id;
  await pool.query(
    `insert into sites (organization_id, name, time_zone, floor_area_m2)
     select $1, 'Bench site ' || g, 'Europe/London', 1000 + g from generate_series(1, $2) g`,
    [org, SITES],
  );
  await pool.query(
    `insert into meters (organization_id, site_id, code, name, quantity, carrier, orientation, installed_at)
     select $1, s.id, 'B-' || g, 'Bench meter ' || g, 'electric_register',
            (array['heat','cooling','steam','electricity'])[1 + g % 4]::energy_carrier,
            (case when g % 10 = 0 then 'export' else 'import' end)::boundary_orientation, '2020-01-01'
       from generate_series(1, $2) g
       join (select id, row_number() over (order by name) as n from sites where organization_id = $1) s
         on s.n = 1 + g % $3`,
    [org, METERS, SITES],
  );
  await pool.query(
    `insert into monthly_rollups (organization_id, meter_id, month, energy_kwh, estimated_kwh, hours, estimated_hours)
     select $1, m.id, (date '2024-12-01' + (k || ' month')::interval)::date,
            round((random() * 10000)::numeric, 6), round((random() * 100)::numeric, 6), 720, 3
       from meters m cross join generate_series(0, $2 - 1) k
      where m.organization_id = $1`,
    [org, MONTHS],
  );
  return org;
}

/** Adds intervals until the table holds `target` rows for the bench org. */
async function growIntervals(
  pool: pg.Pool,
  org: string,
  target: number,
): Promise<void> {
  const { rows } = await pool.query<{ n: string }>(
    "select count(*) as n from intervals where organization_id = $1",
    [org],
  );
  const have = Number(rows[0].n);
  const hoursPerMeter = Math.ceil(target / METERS);
  const startHour = Math.ceil(have / METERS);
  if (startHour >= hoursPerMeter) return;
  const t0 = Date.UTC(2024, 11, 1);
  await pool.query("select ensure_month_partitions($1, $2)", [
    new Date(t0),
    new Date(t0 + hoursPerMeter * 3_600_000),
  ]);
  const step = 500;
  for (let h = startHour; h < hoursPerMeter; h += step) {
    await pool.query(
      `insert into intervals (organization_id, meter_id, interval_start, energy_kwh, quality)
       select $1, m.id, to_timestamp($2 / 1000.0) + (k || ' hour')::interval, round((random() * 10)::numeric, 6), 'measured'
         from meters m cross join generate_series($3::int, $4::int) k
        where m.organization_id = $1`,
      [org, t0, h, Math.min(h + step, hoursPerMeter) - 1],
    );
    process.stdout.write(
      `\r  intervals: ${((Math.min(h + step, hoursPerMeter) * METERS) / 1e6).toFixed(1)} M`,
    );
  }
  process.stdout.write("\n");
}

export async function benchLedger(): Promise<void> {
  const { url, origin } = await benchDatabaseUrl();
  console.log(`database: ${origin}`);
  process.env.DATABASE_URL = url;
  process.env.RESEND_BASE_URL ??= "http://127.0.0.1:9";
  // Nor is Stripe called: a dead local address satisfies the check.
  if (!process.env.STRIPE_SECRET_KEY)
    process.env.STRIPE_API_BASE ??= "http://127.0.0.1:9";
  const { ledgerRows } = await import("../app/ledger/ledger-rows.server");
  const { pool: appPool } = await import("../app/db/client.server");
  const pool = new pg.Pool({ connectionString: url, max: 2 });
  const org = await fixture(pool);
  const results: string[][] = [];
  try {
    const scales = (process.env.LEDGER_BENCH_SCALES ?? "1000000,10000000")
      .split(",")
      .map(Number);
    for (const target of scales) {
      await growIntervals(pool, org, target);
      await pool.query("analyze intervals; analyze monthly_rollups");
      const loader = await time(() =>
        ledgerRows({ organizationId: org, from: FROM, to: TO }),
      );
      const bare = await time(() =>
        pool.query(
          `select meter_id, month, energy_kwh, estimated_kwh from monthly_rollups
            where organization_id = $1 and month between to_date($2, 'YYYY-MM') and to_date($3, 'YYYY-MM')`,
          [org, FROM, TO],
        ),
      );
      results.push([
        `${target / 1e6}M intervals`,
        `${(METERS * MONTHS).toLocaleString("en-GB")} rollups`,
        `${loader.toFixed(1)} ms`,
        `${bare.toFixed(1)} ms`,
        `${(loader / bare).toFixed(2)}×`,
      ]);
    }
  } finally {
    await pool.query("delete from organizations where id = $1", [org]);
    await pool.end();
    await appPool.end();
  }
  const head = [
    "scale",
    "rows read",
    "ledger loader",
    "bare SQL read",
    "loader / bare",
  ];
  const widths = head.map((h, i) =>
    Math.max(h.length, ...results.map((r) => r[i].length)),
  );
  const line = (cells: string[]) =>
    cells.map((c, i) => c.padEnd(widths[i])).join("  ");
  console.log(line(head));
  for (const r of results) console.log(line(r));
  console.log(
    "aim: loader within 2× of the bare read, flat from 1M to 10M intervals (medians of 7 runs)",
  );
}
