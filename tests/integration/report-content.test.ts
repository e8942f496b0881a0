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
import { createOrganization, db, pool, schema } from "../support/db";
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

/**
 * The data-quality counts read the monthly rollups for complete months and
 * intervals only for the rest (app/reports/data/data-quality.server.ts).
 * They must equal, field for field, what reading every interval of the
 * window gives: this is that query, kept here as the reference.
 */
const EVERY_INTERVAL_REFERENCE_SQL = `with live as (
   select m.id, m.interval_minutes, m.code, m.name, m.carrier::text as carrier, m.orientation::text as orientation,
          m.parent_meter_id is not null as sub_meter, m.removed_at is not null as retired,
          s.name as site_name,
          greatest(($2::date)::timestamp at time zone s.time_zone, m.installed_at) as t0,
          least(($3::date)::timestamp at time zone s.time_zone,
                coalesce(m.removed_at, 'infinity'::timestamptz), $5::timestamptz) as t1
     from meters m
     join sites s on s.organization_id = m.organization_id and s.id = m.site_id
    where m.organization_id = $1 and ($4::uuid is null or s.id = $4::uuid)
 ), hours as (
   select l.id, i.interval_start, i.quality::text as quality, l.interval_minutes / 60.0 as length,
          case when i.quality = 'measured'
               then i.interval_start - lag(i.interval_start) over (
                      partition by l.id, i.quality = 'measured' order by i.interval_start)
          end as step
     from live l
     join intervals i on i.organization_id = $1 and i.meter_id = l.id
      and i.interval_start >= l.t0 and i.interval_start < l.t1
    where l.t1 > l.t0
 ), counts as (
   select id,
          coalesce(sum(length) filter (where quality = 'measured'), 0)::float8 as measured,
          coalesce(sum(length) filter (where quality = 'estimated'), 0)::float8 as estimated,
          coalesce(sum(length) filter (where quality = 'edited'), 0)::float8 as edited,
          min(interval_start) filter (where quality = 'measured') as first_measured,
          max(interval_start) filter (where quality = 'measured') as last_measured,
          max(extract(epoch from step) / 3600 - length)::float8 as longest_gap
     from hours group by id
 ), conflicts as (
   select c.meter_id as id, count(*)::int as conflicts,
          count(*) filter (where c.resolved_at is null)::int as open_conflicts
     from reading_conflicts c
     join live l on l.id = c.meter_id
    where c.organization_id = $1
      and c.reading_time < l.t1 and c.reading_time >= l.t0
    group by c.meter_id
 )
 select l.site_name, l.code, l.name, l.carrier, l.orientation, l.sub_meter, l.retired,
        l.t0, l.t1,
        coalesce(k.measured, 0) as measured, coalesce(k.estimated, 0) as estimated,
        coalesce(k.edited, 0) as edited, k.first_measured, k.last_measured, k.longest_gap,
        coalesce(c.conflicts, 0) as conflicts, coalesce(c.open_conflicts, 0) as open_conflicts
   from live l
   left join counts k on k.id = l.id
   left join conflicts c on c.id = l.id
  where l.t1 > l.t0
  order by l.site_name, l.sub_meter, l.code`;

describe("report data quality from rollups", () => {
  /** Each meter's series: [from, to) at its resolution, less gaps, with some estimated or edited. */
  interface Series {
    code: string;
    site: "london" | "kolkata";
    minutes: 15 | 30 | 60;
    installedAt: string;
    removedAt?: string;
    from?: string;
    to?: string;
    missing?: [string, string][];
    estimated?: [string, string][];
    edited?: [string, string][];
  }
  const series: Series[] = [
    {
      // Installed mid-February; a gap across the end of March (local
      // midnight is 23:00 UTC in summer time), the last slot of May
      // missing, estimated hours in June, an edited hour in August and a
      // gap in the night summer time ends.
      code: "A",
      site: "london",
      minutes: 60,
      installedAt: "2025-02-10T13:00:00Z",
      from: "2025-02-10T13:00:00Z",
      to: "2026-01-01T00:00:00Z",
      missing: [
        ["2025-03-31T20:00:00Z", "2025-04-01T03:00:00Z"],
        ["2025-05-31T22:00:00Z", "2025-05-31T23:00:00Z"],
        ["2025-10-26T00:00:00Z", "2025-10-26T03:00:00Z"],
      ],
      estimated: [["2025-06-10T00:00:00Z", "2025-06-10T06:00:00Z"]],
      edited: [["2025-08-05T12:00:00Z", "2025-08-05T13:00:00Z"]],
    },
    {
      // Half-hourly, removed in September; a gap across the end of July.
      code: "B",
      site: "london",
      minutes: 30,
      installedAt: "2020-01-01T00:00:00Z",
      removedAt: "2025-09-15T10:30:00Z",
      from: "2024-12-01T00:00:00Z",
      to: "2025-09-15T10:30:00Z",
      missing: [["2025-07-31T22:00:00Z", "2025-08-01T01:30:00Z"]],
    },
    {
      // Kolkata's months start at 18:30 UTC, between two hours; the last
      // hour of April is estimated, a gap in November.
      code: "C",
      site: "kolkata",
      minutes: 60,
      installedAt: "2020-01-01T00:00:00Z",
      from: "2024-12-20T00:00:00Z",
      to: "2026-01-05T00:00:00Z",
      missing: [["2025-11-10T05:00:00Z", "2025-11-10T08:00:00Z"]],
      estimated: [["2025-04-30T18:00:00Z", "2025-04-30T19:00:00Z"]],
    },
    {
      // Quarter-hourly from the first of October (local); a gap across the
      // end of November and an edited quarter-hour in December.
      code: "D",
      site: "london",
      minutes: 15,
      installedAt: "2025-09-30T23:00:00Z",
      from: "2025-09-30T23:00:00Z",
      to: "2026-01-01T00:00:00Z",
      missing: [["2025-11-30T23:45:00Z", "2025-12-01T00:15:00Z"]],
      edited: [["2025-12-24T10:00:00Z", "2025-12-24T10:15:00Z"]],
    },
    // Never read.
    {
      code: "E",
      site: "london",
      minutes: 60,
      installedAt: "2020-01-01T00:00:00Z",
    },
  ];

  let organizationId: string;
  const siteIds: Record<Series["site"], string> = { london: "", kolkata: "" };

  beforeAll(async () => {
    organizationId = (await createOrganization(["owner"])).id;
    for (const [site, timeZone] of [
      ["london", "Europe/London"],
      ["kolkata", "Asia/Kolkata"],
    ] as const) {
      const [row] = await db
        .insert(schema.sites)
        .values({ organizationId, name: `Quality ${site}`, timeZone })
        .returning({ id: schema.sites.id });
      siteIds[site] = row.id;
    }
    await pool.query(`select ensure_month_partitions($1, $2)`, [
      "2024-12-01T00:00:00Z",
      "2026-02-01T00:00:00Z",
    ]);
    for (const s of series) {
      const [meter] = await db
        .insert(schema.meters)
        .values({
          organizationId,
          siteId: siteIds[s.site],
          code: `Q-${s.code}`,
          name: `Quality meter ${s.code}`,
          quantity: "electric_register",
          carrier: "electricity",
          orientation: "import",
          intervalMinutes: s.minutes,
          installedAt: new Date(s.installedAt),
          removedAt: s.removedAt ? new Date(s.removedAt) : null,
        })
        .returning({ id: schema.meters.id });
      if (!s.from || !s.to) continue;
      const within = (spans: [string, string][] = []) =>
        spans.length
          ? spans.map(([a, b]) => `(t >= '${a}' and t < '${b}')`).join(" or ")
          : "false";
      await pool.query(
        `insert into intervals (organization_id, meter_id, interval_start, energy_kwh, quality)
         select $1, $2, t, 1.5,
                (case when ${within(s.estimated)} then 'estimated'
                      when ${within(s.edited)} then 'edited' else 'measured' end)::interval_quality
           from generate_series($3::timestamptz, $4::timestamptz - $5 * interval '1 minute',
                                $5 * interval '1 minute') as t
          where not (${within(s.missing)})`,
        [organizationId, meter.id, s.from, s.to, s.minutes],
      );
    }
    // The rollups as the write path keeps them: per site-local month.
    await pool.query(
      `insert into monthly_rollups (organization_id, meter_id, month, energy_kwh, estimated_kwh, hours, estimated_hours)
       select i.organization_id, i.meter_id, date_trunc('month', i.interval_start at time zone s.time_zone)::date,
              sum(i.energy_kwh), coalesce(sum(i.energy_kwh) filter (where i.quality = 'estimated'), 0),
              count(*), count(*) filter (where i.quality = 'estimated')
         from intervals i
         join meters m on m.organization_id = i.organization_id and m.id = i.meter_id
         join sites s on s.organization_id = m.organization_id and s.id = m.site_id
        where i.organization_id = $1
        group by 1, 2, 3`,
      [organizationId],
    );
  });

  async function reference(args: {
    siteId: string | null;
    period: { start: string; end: string };
    generatedAt: Date;
  }) {
    const { rows } = await pool.query(EVERY_INTERVAL_REFERENCE_SQL, [
      organizationId,
      args.period.start,
      args.period.end,
      args.siteId,
      args.generatedAt,
    ]);
    return rows.map((r) => ({
      siteName: r.site_name,
      code: r.code,
      name: r.name,
      carrier: r.carrier,
      orientation: r.orientation,
      subMeter: r.sub_meter,
      retired: r.retired,
      from: r.t0,
      to: r.t1,
      measured: r.measured,
      estimated: r.estimated,
      edited: r.edited,
      firstMeasured: r.first_measured,
      lastMeasured: r.last_measured,
      longestInnerGapHours: Math.max(0, r.longest_gap ?? 0),
      conflicts: r.conflicts,
      openConflicts: r.open_conflicts,
    }));
  }

  it("equals reading every interval: gaps across month ends, DST, partial, removed, estimated and edited", async () => {
    const { meterHourCounts } =
      await import("../../app/reports/data/data-quality.server");
    const { reportPeriod } = await app.periods();
    const cases = [
      ["year", "2025"],
      ["quarter", "2025-Q2"],
      ["month", "2025-10"],
    ] as const;
    const generated = [
      "2026-01-05T00:00:00Z",
      "2025-12-10T07:20:00Z",
      "2025-03-31T22:30:00Z",
    ];
    let compared = 0;
    for (const [kind, anchor] of cases)
      for (const at of generated)
        for (const siteId of [null, siteIds.london]) {
          const args = {
            organizationId,
            siteId,
            period: reportPeriod(kind, anchor),
            generatedAt: new Date(at),
          };
          const expected = await reference(args);
          expect(await meterHourCounts(args)).toEqual(expected);
          compared += expected.length;
        }
    expect(compared).toBeGreaterThan(40);

    // And the figures are the ones the series were made with.
    const year = await meterHourCounts({
      organizationId,
      siteId: null,
      period: reportPeriod("year", "2025"),
      generatedAt: new Date("2026-01-05T00:00:00Z"),
    });
    const byCode = new Map(year.map((m) => [m.code, m]));
    // A: 7 hours missing across the end of March; June's estimates break
    // the measured run for 6 hours.
    expect(byCode.get("Q-A")).toMatchObject({
      estimated: 6,
      edited: 1,
      longestInnerGapHours: 7,
      firstMeasured: new Date("2025-02-10T13:00:00Z"),
      lastMeasured: new Date("2025-12-31T23:00:00Z"),
    });
    // B: 3.5 hours missing across the end of July, until its removal.
    expect(byCode.get("Q-B")).toMatchObject({
      retired: true,
      longestInnerGapHours: 3.5,
      lastMeasured: new Date("2025-09-15T10:00:00Z"),
    });
    // C: the period starts at 18:30 UTC, so its first hour is 19:00.
    expect(byCode.get("Q-C")).toMatchObject({
      estimated: 1,
      longestInnerGapHours: 3,
      firstMeasured: new Date("2024-12-31T19:00:00Z"),
    });
    expect(byCode.get("Q-D")).toMatchObject({
      edited: 0.25,
      longestInnerGapHours: 0.5,
    });
    expect(byCode.get("Q-E")).toMatchObject({
      measured: 0,
      firstMeasured: null,
      longestInnerGapHours: 0,
    });
  });
});
