// The Readings page's upload of a year of a supplier's data, in a real
// browser (headless Debian chromium through playwright-core) against the
// production build: one row per meter and day, 48 half-hour columns with
// dd/mm/yyyy dates (46 values on 30 March 2025, 50 on 26 October), 50 meters,
// 876,000 values in all, the size issue #14 names.
//
//   parse   from handing the file to the page to the preview's count of
//           readings: the file read in the browser, parsed in the suggested
//           mapping (Europe/London), fitted to the meters and rendered
//   upload  from "Upload … readings" to "Finished": chunks of 2,500 readings
//           posted one after another to POST /api/v1/orgs/:orgId/readings,
//           each stored and committed before its answer
//
// The meters are half-hourly (METER_MINUTES = 30), so the 876,000 half-hours
// go as they are; with 60 the page adds each hour's two half-hours up.
//
// Database: as the readings bench (DATABASE_URL, else the managed cluster's
// joulebook_bench). The bench's organisation is deleted at the end.

import { randomUUID } from "node:crypto";
import { execSync } from "node:child_process";
import { performance } from "node:perf_hooks";
import pg from "pg";
import { chromium } from "playwright-core";
import { hashPassword } from "../app/auth/password.server";
import { wideSupplierFile } from "../tests/support/wide-supplier-file";
import {
  benchDatabaseUrl,
  ensureBuild,
  startServer,
  stopServer,
} from "./readings.bench";

const METERS = 50;
const FILE_MINUTES = 30;
/** The meters' resolution (see above). */
const METER_MINUTES = 30;
const PASSWORD = "bench-upload-password";
const TIMEOUT_MS = 30 * 60_000;

interface Fixture {
  organizationId: string;
  email: string;
  codes: string[];
}

async function createFixture(pool: pg.Pool): Promise<Fixture> {
  const tag = randomUUID().slice(0, 8);
  const {
    rows: [org],
  } = await pool.query<{ id: string }>(
    "insert into organizations (name) values ($1) returning id",
    [`Upload bench ${tag}`],
  );
  const email = `upload-bench-${tag}@bench.example`;
  const userId = randomUUID();
  await pool.query(
    "insert into users (id, email, name, password_hash) values ($1, $2, $3, $4)",
    [userId, email, `Upload bench ${tag}`, await hashPassword(PASSWORD)],
  );
  await pool.query(
    "insert into memberships (organization_id, user_id, role) values ($1, $2, 'owner')",
    [org.id, userId],
  );
  const {
    rows: [site],
  } = await pool.query<{ id: string }>(
    "insert into sites (organization_id, name, time_zone) values ($1, $2, 'Europe/London') returning id",
    [org.id, `Upload bench site ${tag}`],
  );
  const codes = Array.from(
    { length: METERS },
    (_, i) => `UB${String(i + 1).padStart(2, "0")}-${tag}`,
  );
  await pool.query(
    `insert into meters (organization_id, site_id, code, name, quantity, carrier, orientation,
                         sensor_at, default_pressure_bar_abs, installed_at, interval_minutes)
     select $1, $2, c, 'Bench heat meter ' || c, 'water_heat', 'heat', 'import', 'return', 6, '2020-01-01T00:00:00Z', $4
       from unnest($3::text[]) as u(c)`,
    [org.id, site.id, codes, METER_MINUTES],
  );
  return { organizationId: org.id, email, codes };
}

const seconds = (ms: number) => `${(ms / 1000).toFixed(1)} s`;
const grouped = (n: number) => Math.round(n).toLocaleString("en-GB");

export async function benchUpload(): Promise<void> {
  ensureBuild();
  const { url, origin } = await benchDatabaseUrl();
  console.log(`database: ${origin}`);
  const pool = new pg.Pool({ connectionString: url, max: 2 });
  const fixture = await createFixture(pool);
  const file = wideSupplierFile({
    meterCodes: fixture.codes,
    // A whole past year: readings in the future are refused.
    firstDay: "2025-01-01",
    days: 365,
    minutes: FILE_MINUTES,
  });
  const readings = (file.values * FILE_MINUTES) / METER_MINUTES;
  console.log(
    `file: ${grouped(file.values)} half-hour values, ${METERS} meters × 365 days, ${(file.csv.length / 1e6).toFixed(1)} MB of CSV; ${grouped(readings)} readings at the meters' ${METER_MINUTES} minutes`,
  );
  const { child, baseUrl } = await startServer(url);
  const browser = await chromium.launch({
    executablePath: execSync(
      "command -v chromium || command -v chromium-browser",
      {
        shell: "/bin/bash",
        encoding: "utf8",
      },
    ).trim(),
    args: ["--headless", "--no-sandbox", "--disable-gpu"],
  });
  try {
    const page = await browser.newPage({
      viewport: { width: 1280, height: 900 },
    });
    page.setDefaultTimeout(TIMEOUT_MS);
    await page.goto(`${baseUrl}/sign-in`);
    await page.getByLabel("E-mail address").fill(fixture.email);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(/\/o\/[0-9a-f-]{36}$/);
    await page.goto(`${baseUrl}/o/${fixture.organizationId}/readings`);

    const parseStart = performance.now();
    await page
      .getByLabel("File of readings (CSV or Excel .xlsx)")
      .setInputFiles({
        name: "year-half-hourly.csv",
        mimeType: "text/csv",
        buffer: Buffer.from(file.csv),
      });
    const count = page.getByTestId("readings-count");
    await count
      .getByText(`${grouped(readings)} readings`, { exact: false })
      .waitFor();
    const parseMs = performance.now() - parseStart;
    const problems = await page
      .getByRole("table", { name: "Problems in the file" })
      .count();
    if (problems > 0)
      throw new Error(`the page found problems: ${await count.textContent()}`);

    const uploadStart = performance.now();
    await page
      .getByRole("button", { name: `Upload ${grouped(readings)} readings` })
      .click();
    await page.getByText(/^Finished:/).waitFor();
    const uploadMs = performance.now() - uploadStart;
    const counts = await page.getByTestId("upload-counts").textContent();

    const {
      rows: [stored],
    } = await pool.query<{ n: number }>(
      "select count(*)::int as n from intervals where organization_id = $1 and quality = 'measured'",
      [fixture.organizationId],
    );
    console.table([
      {
        step: "parse (file → preview)",
        time: seconds(parseMs),
        rate: `${grouped(file.values / (parseMs / 1000))} values/s`,
      },
      {
        step: "upload (2,500 a chunk)",
        time: seconds(uploadMs),
        rate: `${grouped(readings / (uploadMs / 1000))} readings/s`,
      },
    ]);
    console.log(`page: ${counts}; intervals stored: ${grouped(stored.n)}`);
    if (stored.n !== readings)
      throw new Error(`expected ${readings} intervals, found ${stored.n}`);
  } finally {
    await browser.close();
    await stopServer(child);
    // Cascades to its site, meters, readings and intervals.
    await pool.query("delete from organizations where id = $1", [
      fixture.organizationId,
    ]);
    await pool.end();
  }
}
