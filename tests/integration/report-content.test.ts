/**
 * The content of a report, end to end: real readings through the ingest
 * path into a fresh organisation, a month closed, a late reading that
 * becomes an adjusting entry, a saved baseline; then the report's data and
 * PDF. The PDF's text must carry the site names and the very totals the
 * Ledger shows; page 1 must render.
 */
import { execFileSync } from "node:child_process";
import {
  existsSync,
  mkdtempSync,
  rmSync,
  statSync,
  writeFileSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

// The app's modules read the environment when they load.
applyAppTestEnv();

const app = {
  ingest: () => import("../../app/ingest/ingest-readings.server"),
  idle: () => import("../../app/ingest/after-ingest.server"),
  close: () => import("../../app/ledger/month-close.server"),
  ledger: () => import("../../app/ledger/ledger-rows.server"),
  balance: () => import("../../app/ledger/balance"),
  periods: () => import("../../app/reports/periods"),
  data: () => import("../../app/reports/report-data.server"),
  pdf: () => import("../../app/reports/pdf/render-report.server"),
  client: () => import("../../app/db/client.server"),
};

const dir = mkdtempSync(join(tmpdir(), "joulebook-report-"));
afterAll(async () => {
  rmSync(dir, { recursive: true, force: true });
  await pool.end();
  await (await app.client()).pool.end();
});

/** Hourly register reads from `start`, `hours` steps of `step` kWh. */
function registerSeries(
  code: string,
  start: string,
  hours: number,
  first: number,
  step: number,
) {
  const t0 = new Date(start).getTime();
  return Array.from({ length: hours + 1 }, (_, i) => ({
    meter: code,
    quantity: "electric_register",
    time: new Date(t0 + i * 3_600_000).toISOString(),
    register_kwh: Math.round((first + i * step) * 1000) / 1000,
  }));
}

function waterHeat(code: string, start: string, volume: number) {
  const t0 = new Date(start).getTime();
  return {
    meter: code,
    quantity: "water_heat",
    start: new Date(t0).toISOString(),
    end: new Date(t0 + 3_600_000).toISOString(),
    volume_m3: volume,
    flow_temp_c: 70,
    return_temp_c: 45,
  };
}

let org: MeteredOrg;
let owner: { id: string; name: string };

async function ingest(readings: unknown[], userId: string | null = null) {
  const { ingestReadings } = await app.ingest();
  const result = await ingestReadings({
    organizationId: org.org.id,
    source: "api",
    gatewayId: userId ? null : org.gatewayId,
    userId,
    readings,
  });
  expect(result.rejected).toEqual([]);
  await (await app.idle()).estimationIdle();
}

beforeAll(async () => {
  org = await createMeteredOrg({ roles: ["owner"] });
  const [user] = await db
    .select({ id: schema.users.id, name: schema.users.name })
    .from(schema.users)
    .where(eq(schema.users.id, org.org.members[0].id));
  owner = { id: user.id, name: user.name };
  const { register, export: solar, water } = org.meters;
  // January and February 2025: imports, solar exports and heat.
  await ingest([
    ...registerSeries(register.code, "2025-01-10T00:00:00Z", 24, 1000, 12.5),
    ...registerSeries(solar.code, "2025-01-10T09:00:00Z", 6, 200, 3.25),
    waterHeat(water.code, "2025-01-10T06:00:00Z", 4.2),
    waterHeat(water.code, "2025-01-10T07:00:00Z", 3.9),
    ...registerSeries(register.code, "2025-02-03T00:00:00Z", 12, 5000, 10),
    waterHeat(water.code, "2025-02-03T06:00:00Z", 2.5),
  ]);
  const { closeMonth } = await app.close();
  expect(
    await closeMonth({
      organizationId: org.org.id,
      actorUserId: owner.id,
      month: "2025-01",
      siteId: org.siteId,
    }),
  ).toEqual({ ok: true });
  // A late heat reading in the closed month: an adjusting entry by the owner.
  await ingest([waterHeat(water.code, "2025-01-11T06:00:00Z", 1.5)], owner.id);

  // Weather for both months and a saved baseline of the site's heat.
  const days: string[] = [];
  for (
    let d = new Date("2025-01-01T00:00:00Z");
    d < new Date("2025-03-01T00:00:00Z");
    d.setUTCDate(d.getUTCDate() + 1)
  )
    days.push(d.toISOString().slice(0, 10));
  await pool.query(
    `insert into daily_weather (organization_id, site_id, day, mean_temp_c, source)
     select $1, $2, d, 5.5, 'upload' from unnest($3::date[]) as d`,
    [org.org.id, org.siteId, days],
  );
  await db.insert(schema.baselines).values({
    organizationId: org.org.id,
    siteId: org.siteId,
    carrier: "heat",
    periodFrom: "2024-01-01",
    periodTo: "2024-12-31",
    granularity: "monthly",
    model: {
      method: "ols",
      driver: "hdd",
      baseC: 15.5,
      granularity: "monthly",
      slope: 0.5,
      intercept: 20,
      n: 12,
      p: 2,
      r2: 0.91,
      cvrmse: 8.2,
      nmbe: 0,
      rmse: 10,
      meanKwh: 120,
      points: [
        { month: "2024-01", dd: 300, kwh: 170 },
        { month: "2024-07", dd: 10, kwh: 25 },
      ],
    },
    createdByUserId: owner.id,
  });
});

describe("report content", () => {
  it("carries the ledger's figures, the months' status, adjustments and a baseline", async () => {
    const { ledgerRows } = await app.ledger();
    const { formatDecimal } = await app.balance();
    const { reportPeriod } = await app.periods();
    const { loadReportData } = await app.data();
    const { createReportDocument, drawReport, pdfBytes } = await app.pdf();

    const period = reportPeriod("quarter", "2025-Q1");
    const ledger = await ledgerRows({
      organizationId: org.org.id,
      from: "2025-01",
      to: "2025-03",
    });
    expect(ledger.rows.length).toBeGreaterThanOrEqual(4);

    const data = await loadReportData({
      organizationId: org.org.id,
      siteId: null,
      period,
      reportId: "00000000-0000-4000-8000-00000000abcd",
      authorName: owner.name,
      generatedAt: new Date(),
    });
    // The report's totals are the ledger's, digit for digit, per carrier, cost included.
    expect(
      data.carrierTotals.map((t) => ({
        carrier: t.carrier,
        imports_kwh: t.importsKwh,
        exports_kwh: t.exportsKwh,
        net_kwh: t.netKwh,
        cost: t.cost,
        currency: t.currency,
      })),
    ).toEqual(
      ledger.totals.map((t) => ({
        carrier: t.carrier,
        imports_kwh: t.imports_kwh,
        exports_kwh: t.exports_kwh,
        net_kwh: t.net_kwh,
        cost: t.cost,
        currency: t.currency,
      })),
    );
    // And its carbon is the ledger's, per carrier and across carriers.
    expect(
      data.carbon.byCarrier.map((c) => [c.carrier, c.co2eKg, c.co2eMarketKg]),
    ).toEqual(
      ledger.totals.map((t) => [t.carrier, t.co2e_kg, t.co2e_market_kg]),
    );
    expect(data.carbon.totalKg).toBe(ledger.carbon_total.co2e_kg);
    expect(data.months.map((m) => [m.month, m.closed])).toEqual([
      ["2025-01", true],
      ["2025-02", false],
      ["2025-03", false],
    ]);
    expect(data.allMonthsClosed).toBe(false);
    // The late reading, by the owner; the gap estimates it changed follow it.
    expect(data.adjustments[0]).toMatchObject({
      month: "2025-01",
      source: "late_data",
      author: owner.name,
      meterCode: org.meters.water.code,
    });
    const janHeat = ledger.rows.find(
      (r) => r.month === "2025-01" && r.carrier === "heat",
    )!;
    expect(janHeat.adjustment_count).toBe(data.adjustments.length);
    const adjusted = data.adjustments.reduce(
      (s, a) => s + Number(a.deltaKwh),
      0,
    );
    expect(adjusted).toBeCloseTo(Number(janHeat.adjustments_kwh), 6);

    // Heat against the baseline: 20 kWh + 0.5 kWh/K·d × HDD, HDD = 31 days × (15.5 − 5.5) K.
    const [baseline] = data.sites[0].baselines;
    expect(baseline.months[0]).toMatchObject({
      month: "2025-01",
      hdd: 310,
      dd: 310,
    });
    expect(baseline.months[0].expectedKwh).toBeCloseTo(20 + 0.5 * 310, 9);

    const doc = createReportDocument({
      title: "Report",
      subject: org.org.name,
      author: owner.name,
    });
    const drawn = await drawReport(doc, data);
    const bytes = pdfBytes(doc);
    doc.end();
    const file = join(dir, "report.pdf");
    writeFileSync(file, await bytes);
    expect(drawn.pageCount).toBeGreaterThanOrEqual(4);

    const text = execFileSync("pdftotext", ["-layout", file, "-"], {
      encoding: "utf8",
    });
    const flat = text.replace(/\s+/g, " ");
    expect(text).toContain(data.sites[0].name);
    expect(text).toContain(org.org.name);
    for (const total of ledger.totals.flatMap((t) => [
      t.imports_kwh,
      t.exports_kwh,
      t.net_kwh,
    ]))
      expect(text).toContain(formatDecimal(total, 1));
    for (const row of ledger.rows)
      expect(text).toContain(formatDecimal(row.net_kwh, 1));
    expect(text).toContain("Provisional: 2 of 3 months open");
    expect(text).toContain("Adjusting entries");
    expect(text).toContain(owner.name);
    // The saved model's periods span two months: the page's caution, printed.
    expect(flat).toContain("Caution: Fitted on 2 months, fewer than the 12");
    expect(flat).toContain("Figures are for energy management, not for trade.");
    expect(flat).toContain(
      "Billing third parties from sub-meters needs meters approved under your local legal-metrology rules.",
    );
    expect(flat).toContain("Steam and pressurised hot water are hazardous");
    expect(text).toContain(`Page ${drawn.pageCount} of ${drawn.pageCount}`);

    // Every font is embedded (no standard font left to the viewer).
    const fonts = execFileSync("pdffonts", [file], { encoding: "utf8" })
      .trim()
      .split("\n")
      .slice(2);
    expect(fonts.length).toBeGreaterThan(0);
    for (const line of fonts)
      expect(line).toMatch(/\sCID TrueType\s+Identity-H\s+yes\s+yes\s+yes\s/);

    execFileSync("pdftoppm", [
      "-png",
      "-r",
      "60",
      "-f",
      "1",
      "-l",
      "1",
      file,
      join(dir, "page"),
    ]);
    const png = ["page-1.png", "page-01.png", "page-001.png"]
      .map((p) => join(dir, p))
      .find(existsSync);
    expect(png).toBeDefined();
    expect(statSync(png!).size).toBeGreaterThan(5_000);
  });

  it("says so when every month is closed, and a site report holds that site only", async () => {
    const { closeMonth } = await app.close();
    for (const month of ["2025-02", "2025-03"])
      expect(
        await closeMonth({
          organizationId: org.org.id,
          actorUserId: owner.id,
          month,
          siteId: null,
        }),
      ).toEqual({ ok: true });
    const { reportPeriod } = await app.periods();
    const { loadReportData } = await app.data();
    const { createReportDocument, drawReport, pdfBytes } = await app.pdf();
    const data = await loadReportData({
      organizationId: org.org.id,
      siteId: org.siteId,
      period: reportPeriod("quarter", "2025-Q1"),
      reportId: "00000000-0000-4000-8000-00000000abce",
      authorName: owner.name,
      generatedAt: new Date(),
    });
    expect(data.allMonthsClosed).toBe(true);
    expect(data.scope.label).toBe(data.sites[0].name);
    expect(data.sites).toHaveLength(1);
    const doc = createReportDocument({
      title: "Report",
      subject: org.org.name,
      author: owner.name,
    });
    await drawReport(doc, data);
    doc.end();
    const file = join(dir, "closed.pdf");
    writeFileSync(file, await pdfBytes(doc));
    const text = execFileSync("pdftotext", ["-layout", file, "-"], {
      encoding: "utf8",
    });
    expect(text).toContain("All months closed");
    expect(text).not.toContain("Provisional");
  });
});
