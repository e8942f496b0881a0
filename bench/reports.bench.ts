/**
 * Time to make the demo organisation's signed 12-month report, step by step,
 * beside two references measured in the same run: the bare SQL read of the
 * same year's rollups, and pdfkit writing the same number of pages of plain
 * text with the same fonts (the floor for any PDF of that length).
 *
 * Uses the development database of `npm start` (where the demo lives), or
 * DATABASE_URL; with neither seeded it says how to get the demo.
 */
import { spawnSync } from "node:child_process";
import { performance } from "node:perf_hooks";
import path from "node:path";
import pg from "pg";
import { printAim, printBenchLine } from "./aims";
import { managedUrl } from "./readings.bench";

// Issue #17: a year's signed report in half a second, its data load within
// ten times the bare read of the rollups it needs.
const TOTAL_AIM_MS = 500;
const LOAD_TO_BARE_READ_AIM = 10;

const DEMO_ORGANIZATION = "Larchmere Borough Estates";
const RUNS = 3;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

async function demoOrganization(url: string) {
  const pool = new pg.Pool({ connectionString: url, max: 1 });
  try {
    // The latest calendar year with all twelve months of data.
    const { rows } = await pool.query<{ id: string; last: string | null }>(
      `select o.id,
              (select to_char(date_trunc('year', month), 'YYYY')
                 from monthly_rollups r where r.organization_id = o.id
                group by 1 having count(distinct month) = 12
                order by 1 desc limit 1) as last
         from organizations o where o.name = $1`,
      [DEMO_ORGANIZATION],
    );
    return rows[0] ?? null;
  } finally {
    await pool.end();
  }
}

function ensureSigningIdentity(): void {
  const root = path.resolve(import.meta.dirname, "..");
  spawnSync(
    process.execPath,
    ["--import", "tsx", "scripts/ensure-signing-identity.ts"],
    { cwd: root, stdio: "ignore", env: process.env },
  );
}

export async function benchReports(): Promise<void> {
  const url = process.env.DATABASE_URL ?? managedUrl("joulebook");
  const demo = await demoOrganization(url).catch(() => null);
  if (!demo?.last) {
    console.log(
      `no demo organisation in ${process.env.DATABASE_URL ? "DATABASE_URL" : "database joulebook"}: run npm start once to seed it`,
    );
    return;
  }
  // The app's modules read the validated environment when first imported.
  process.env.DATABASE_URL = url;
  process.env.RESEND_BASE_URL ??= "http://127.0.0.1:9";
  process.env.STRIPE_API_BASE ??= "http://127.0.0.1:9";
  process.env.SIGNING_DIR ??= path.resolve(
    import.meta.dirname,
    "../.data/signing",
  );
  ensureSigningIdentity();

  const { reportPeriod } = await import("../app/reports/periods");
  const { loadReportData } = await import("../app/reports/report-data.server");
  const render = await import("../app/reports/pdf/render-report.server");
  const signing = await import("../app/reports/signing/sign-pdf.server");
  const { signingIdentityFromEnv } =
    await import("../app/reports/signing/identity.server");
  const { pool } = await import("../app/db/client.server");
  const identity = await signingIdentityFromEnv();
  const period = reportPeriod("year", demo.last);

  const steps = {
    load: [] as number[],
    draw: [] as number[],
    sign: [] as number[],
  };
  const totals: number[] = [];
  const bare: number[] = [];
  const plain: number[] = [];
  let pages = 0;
  let bytes = 0;
  for (let run = 0; run <= RUNS; run++) {
    // Run 0 warms up module caches and the font parse; it is not counted.
    const t0 = performance.now();
    const data = await loadReportData({
      organizationId: demo.id,
      siteId: null,
      period,
      reportId: "00000000-0000-4000-8000-000000000000",
      authorName: "Bench",
      generatedAt: new Date(),
    });
    const t1 = performance.now();
    const doc = render.createReportDocument({
      title: `${DEMO_ORGANIZATION} · ${period.label}`,
      subject: "bench",
      author: "bench",
    });
    const collected = render.pdfBytes(doc);
    const { pageCount } = await render.drawReport(doc, data);
    signing.addSignaturePlaceholder(doc, {
      reason: "bench",
      name: identity.signerName,
      location: "bench",
      contactInfo: "",
    });
    doc.end();
    const unsigned = await collected;
    const t2 = performance.now();
    const signed = await signing.signPdf(unsigned, identity);
    const t3 = performance.now();

    const b0 = performance.now();
    await pool.query(
      `select * from monthly_rollups
        where organization_id = $1 and month >= $2 and month < $3`,
      [demo.id, period.start, period.end],
    );
    const b1 = performance.now();
    const p0 = performance.now();
    await plainPages(render, pageCount);
    const p1 = performance.now();
    if (run === 0) continue;
    steps.load.push(t1 - t0);
    steps.draw.push(t2 - t1);
    steps.sign.push(t3 - t2);
    totals.push(t3 - t0);
    bare.push(b1 - b0);
    plain.push(p1 - p0);
    pages = pageCount;
    bytes = signed.length;
  }
  await pool.end();

  const ms = (v: number[]) => `${median(v).toFixed(0).padStart(7)} ms`;
  console.log(
    `demo ${period.label} report, all sites: ${pages} pages, ${(bytes / 1024).toFixed(0)} KiB (median of ${RUNS})`,
  );
  console.log(
    `  load ledger data        ${ms(steps.load)}   | reference: bare SQL read of the year's rollups ${ms(bare)}`,
  );
  console.log(
    `  draw pages              ${ms(steps.draw)}   | reference: ${pages} pages of plain text, same fonts ${ms(plain)}`,
  );
  console.log(`  sign (PKCS#7, SHA-256)  ${ms(steps.sign)}`);
  console.log(`  total, generate + sign  ${ms(totals)}\n`);
  const total = median(totals);
  const load = median(steps.load);
  const bareRead = median(bare);
  printAim(
    "total, generate + sign",
    `${total.toFixed(0)} ms`,
    `≤ ${TOTAL_AIM_MS} ms`,
    total <= TOTAL_AIM_MS,
  );
  printAim(
    "data load / bare read",
    `${(load / bareRead).toFixed(1)} ×`,
    `≤ ${LOAD_TO_BARE_READ_AIM} ×`,
    load <= LOAD_TO_BARE_READ_AIM * bareRead,
  );
  printBenchLine("reports", [
    ["total_ms", total],
    ["data_ms", load],
    ["bare_read_ms", bareRead],
  ]);
}

/** pdfkit writing n pages of body text: the cost of any PDF that long. */
async function plainPages(
  render: typeof import("../app/reports/pdf/render-report.server"),
  n: number,
): Promise<void> {
  const doc = render.createReportDocument({
    title: "plain",
    subject: "plain",
    author: "plain",
  });
  const collected = render.pdfBytes(doc);
  const line = "Monthly energy crossing the site boundary, in kWh. ".repeat(2);
  for (let page = 0; page < n; page++) {
    if (page > 0) doc.addPage();
    for (let i = 0; i < 40; i++) doc.text(line);
  }
  doc.end();
  await collected;
}
