/**
 * Cooling is delivered energy, not a negative import (design.md, "Delivered
 * energy and the thermodynamic view"). Chilled water reaches a fresh metered
 * organisation through the readings API beside electricity, solar export and
 * heat; then every consumer of the ledger is read: the ledger API, its CSV
 * and XLSX exports, the Overview loader and a report's data and PDF.
 *
 * - imports_kwh is never negative and exports_kwh never positive, for any
 *   carrier; cooling delivered is the positive magnitude of the chilled
 *   water's (negative) heat flow;
 * - no figure adds unlike carriers into one kWh total;
 * - the stored intervals keep the signed physics, and the signed
 *   thermodynamic view survives in the site balance, labelled.
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import ExcelJS from "exceljs";
import Papa from "papaparse";
import { RouterContextProvider } from "react-router";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { db, pool, schema } from "../support/db";
import { Client } from "../support/http";
import {
  addCoolingMeter,
  createMeteredOrg,
  type MeteredOrg,
  type MeterRef,
} from "../support/metered-org";

// The app's modules read the environment when they load.
applyAppTestEnv();

const app = {
  overview: () => import("../../app/routes/overview"),
  pageAccess: () => import("../../app/auth/page-access.server"),
  periods: () => import("../../app/reports/periods"),
  data: () => import("../../app/reports/report-data.server"),
  pdf: () => import("../../app/reports/pdf/render-report.server"),
  balance: () => import("../../app/ledger/balance"),
  client: () => import("../../app/db/client.server"),
};

const dir = mkdtempSync(join(tmpdir(), "joulebook-cooling-"));
afterAll(async () => {
  rmSync(dir, { recursive: true, force: true });
  await pool.end();
  await (await app.client()).pool.end();
});

/** YYYY-MM of the month `back` months before this one (UTC). */
function monthBack(back: number): string {
  const now = new Date();
  return new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - back, 1))
    .toISOString()
    .slice(0, 7);
}
// The Overview shows the last full month and compares it with a year before.
const MONTH = monthBack(1);
const YEAR_BEFORE = monthBack(13);

/** Chilled water in hour `hour` of the 10th: 5 m³ warmed from 6 °C to 12 °C, about −35 kWh. */
function chilledWater(code: string, month: string, hour: number) {
  const start = new Date(`${month}-10T00:00:00Z`).getTime() + hour * 3_600_000;
  return {
    meter: code,
    quantity: "water_heat",
    start: new Date(start).toISOString(),
    end: new Date(start + 3_600_000).toISOString(),
    volume_m3: 5,
    flow_temp_c: 6,
    return_temp_c: 12,
  };
}

function registerReads(code: string, month: string, values: number[]) {
  const t0 = new Date(`${month}-10T08:00:00Z`).getTime();
  return values.map((register_kwh, i) => ({
    meter: code,
    quantity: "electric_register",
    time: new Date(t0 + i * 3_600_000).toISOString(),
    register_kwh,
  }));
}

type LedgerRow = {
  site_id: string;
  month: string;
  carrier: string;
  imports_kwh: string;
  exports_kwh: string;
  net_kwh: string;
};

let org: MeteredOrg;
let cooling: MeterRef;
/** A second chilled-water meter, read only a year before MONTH. */
let earlierCooling: MeterRef;
let manager: Client;
/** Σ of the cooling meter's stored hours in MONTH: the signed heat flow. */
let coolingHeatFlow: string;

beforeAll(async () => {
  org = await createMeteredOrg({ roles: ["owner"], timeZone: "UTC" });
  cooling = await addCoolingMeter(org);
  // Readings a year apart on one meter would be a gap the app estimates;
  // the year before goes to a meter of its own.
  earlierCooling = await addCoolingMeter(org, `C0-${org.tag}`);
  const readings = [
    chilledWater(cooling.code, MONTH, 10),
    chilledWater(cooling.code, MONTH, 11),
    chilledWater(cooling.code, MONTH, 12),
    chilledWater(earlierCooling.code, YEAR_BEFORE, 10),
    chilledWater(earlierCooling.code, YEAR_BEFORE, 11),
    ...registerReads(org.meters.register.code, MONTH, [100, 112.5, 126]),
    ...registerReads(org.meters.export.code, MONTH, [40, 47.25, 55]),
    {
      meter: org.meters.water.code,
      quantity: "water_heat",
      start: `${MONTH}-10T06:00:00Z`,
      end: `${MONTH}-10T07:00:00Z`,
      volume_m3: 2,
      flow_temp_c: 70,
      return_temp_c: 45,
    },
  ];
  const posted = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(posted.status).toBe(200);
  expect(await posted.json()).toMatchObject({ rejected: [] });

  // The stored hours keep the physics: chilled water is heat leaving the site.
  const { rows } = await pool.query<{ kwh: string; n: number }>(
    `select sum(energy_kwh)::text as kwh, count(*)::int as n from intervals
      where organization_id = $1 and meter_id = $2
        and interval_start >= $3::date and interval_start < ($3::date + interval '1 month')`,
    [org.org.id, cooling.id, `${MONTH}-01`],
  );
  expect(rows[0].n).toBe(3);
  expect(Number(rows[0].kwh)).toBeLessThan(-100);
  coolingHeatFlow = rows[0].kwh;

  manager = new Client();
  await manager.signIn(org.org.members[0].email, org.org.members[0].password);
});

/** The exact decimal negation of a decimal string, as PostgreSQL prints it. */
/** A decimal text without trailing zeros, as the exports write it. */
function plain(value: string): string {
  return value.includes(".")
    ? value.replace(/0+$/, "").replace(/\.$/, "")
    : value;
}

async function negated(value: string): Promise<string> {
  const { rows } = await pool.query<{ v: string }>(
    "select (-($1::numeric))::text as v",
    [value],
  );
  return rows[0].v;
}

function expectDeliveredAndExported(rows: readonly LedgerRow[]) {
  for (const row of rows) {
    expect(Number(row.imports_kwh), row.carrier).toBeGreaterThanOrEqual(0);
    expect(Number(row.exports_kwh), row.carrier).toBeLessThanOrEqual(0);
  }
}

describe("cooling delivered", () => {
  it("the ledger API shows chilled water as cooling delivered (≥ 0), exports ≤ 0, totals per carrier only", async () => {
    const response = await manager.get(
      `/api/v1/orgs/${org.org.id}/ledger?from=${MONTH}&to=${MONTH}`,
    );
    expect(response.status).toBe(200);
    const ledger = (await response.json()) as {
      rows: LedgerRow[];
      totals: unknown;
    };
    expect(ledger.rows.map((r) => r.carrier).sort()).toEqual([
      "cooling",
      "electricity",
      "heat",
    ]);
    expectDeliveredAndExported(ledger.rows);
    const coolingRow = ledger.rows.find((r) => r.carrier === "cooling")!;
    expect(coolingRow.imports_kwh).toBe(await negated(coolingHeatFlow));
    expect(Number(coolingRow.exports_kwh)).toBe(0);
    expect(coolingRow.net_kwh).toBe(coolingRow.imports_kwh);
    const electricity = ledger.rows.find((r) => r.carrier === "electricity")!;
    expect(Number(electricity.imports_kwh)).toBeCloseTo(26, 6);
    expect(Number(electricity.exports_kwh)).toBeCloseTo(-15, 6);

    // Totals: one per carrier, each that carrier's own sums; none over carriers.
    expect(Array.isArray(ledger.totals)).toBe(true);
    const totals = ledger.totals as (LedgerRow & { carrier: string })[];
    expect(totals.map((t) => t.carrier).sort()).toEqual([
      "cooling",
      "electricity",
      "heat",
    ]);
    for (const total of totals) {
      const row = ledger.rows.find((r) => r.carrier === total.carrier)!;
      expect(Number(total.imports_kwh)).toBe(Number(row.imports_kwh));
      expect(Number(total.exports_kwh)).toBe(Number(row.exports_kwh));
      expect(Number(total.net_kwh)).toBe(Number(row.net_kwh));
    }
  });

  it("the CSV and XLSX exports carry the same delivered and exported figures, and per-carrier totals", async () => {
    const query = `from=${MONTH}&to=${MONTH}`;
    const json = (await (
      await manager.get(`/api/v1/orgs/${org.org.id}/ledger?${query}`)
    ).json()) as { rows: LedgerRow[] };
    const csvResponse = await manager.get(
      `/api/v1/orgs/${org.org.id}/ledger.csv?${query}`,
    );
    expect(csvResponse.status).toBe(200);
    const csv = Papa.parse<Record<string, string>>(await csvResponse.text(), {
      header: true,
      skipEmptyLines: true,
    });
    expect(csv.errors).toEqual([]);
    // The CSV has readable headings and carrier names, and a total row per carrier.
    const carrierOf = (label: string) => label.toLowerCase();
    const entries = csv.data.filter((l) => l.Site !== "Total");
    expect(entries).toHaveLength(3);
    for (const line of csv.data) {
      const carrier = carrierOf(line.Carrier);
      expect(Number(line["Delivered (kWh)"]), carrier).toBeGreaterThanOrEqual(
        0,
      );
      expect(Number(line["Exported (kWh)"]), carrier).toBeLessThanOrEqual(0);
    }
    for (const line of entries) {
      const row = json.rows.find((r) => r.carrier === carrierOf(line.Carrier))!;
      expect(line["Delivered (kWh)"]).toBe(plain(row.imports_kwh));
      expect(line["Exported (kWh)"]).toBe(plain(row.exports_kwh));
    }
    expect(
      entries.find((l) => l.Carrier === "Cooling")!["Delivered (kWh)"],
    ).toBe(plain(await negated(coolingHeatFlow)));
    expect(
      csv.data
        .filter((l) => l.Site === "Total")
        .map((l) => l.Carrier)
        .sort(),
    ).toEqual(["Cooling", "Electricity", "Heat"]);

    const xlsxResponse = await manager.get(
      `/api/v1/orgs/${org.org.id}/ledger.xlsx?${query}`,
    );
    expect(xlsxResponse.status).toBe(200);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await xlsxResponse.arrayBuffer());
    const sheet = book.getWorksheet("Ledger")!;
    const headers = (sheet.getRow(1).values as unknown[]).slice(1);
    const column = (name: string) => headers.indexOf(name) + 1;
    const lines: Record<string, unknown>[] = [];
    sheet.eachRow((row, n) => {
      if (n === 1) return;
      lines.push(
        Object.fromEntries(
          headers.map((h, i) => [h, row.getCell(i + 1).value]),
        ),
      );
    });
    expect(column("Delivered (kWh)")).toBeGreaterThan(0);
    for (const line of lines) {
      expect(line["Delivered (kWh)"] as number).toBeGreaterThanOrEqual(0);
      expect(line["Exported (kWh)"] as number).toBeLessThanOrEqual(0);
    }
    // Every total line names its carrier: no total over unlike carriers.
    const totals = lines.filter((l) => String(l.Site).startsWith("Total"));
    expect(totals.map((t) => t.Carrier).sort()).toEqual([
      "Cooling",
      "Electricity",
      "Heat",
    ]);
    const coolingTotal = totals.find((t) => t.Carrier === "Cooling")!;
    expect(coolingTotal["Delivered (kWh)"]).toBeCloseTo(
      -Number(coolingHeatFlow),
      6,
    );
  });

  it("the Overview loader gives delivered and exported energy per carrier, never a sum over carriers", async () => {
    const { loader } = await app.overview();
    const request = new Request(`http://localhost/o/${org.org.id}/overview`, {
      headers: { cookie: manager.cookieHeader() },
    });
    // The layouts' middleware resolves the person and membership first.
    const { signedInMiddleware, memberMiddleware } = await app.pageAccess();
    const args = {
      request,
      url: new URL(request.url),
      params: { orgId: org.org.id },
      context: new RouterContextProvider(),
      pattern: "/o/:orgId/overview",
    };
    const next = async () => new Response();
    await signedInMiddleware(args, next);
    await memberMiddleware(args, next);
    const data = await loader(args as unknown as Parameters<typeof loader>[0]);

    // The chart: one entry per month and carrier, delivered ≥ 0, exported ≤ 0.
    const month = data.byCarrier.filter((d) => d.month === MONTH);
    expect(month.map((d) => d.carrier).sort()).toEqual([
      "cooling",
      "electricity",
      "heat",
    ]);
    for (const entry of data.byCarrier) {
      expect(entry.carrier).toBeTruthy();
      expect(entry.delivered_kwh).toBeGreaterThanOrEqual(0);
      expect(entry.exported_kwh).toBeLessThanOrEqual(0);
    }
    const coolingMonth = month.find((d) => d.carrier === "cooling")!;
    expect(coolingMonth.delivered_kwh).toBeCloseTo(-Number(coolingHeatFlow), 6);
    expect(coolingMonth.exported_kwh).toBe(0);
    expect(
      month.find((d) => d.carrier === "electricity")!.exported_kwh,
    ).toBeCloseTo(-15, 6);

    // Sites that changed most: per site and carrier. Three hours of cooling
    // against two a year before is a rise of half, not a fall.
    const drift = data.drift.filter((d) => d.site_id === org.siteId);
    expect(drift.every((d) => typeof d.carrier === "string")).toBe(true);
    const coolingDrift = drift.find((d) => d.carrier === "cooling")!;
    expect(coolingDrift.delivered_kwh).toBeCloseTo(-Number(coolingHeatFlow), 6);
    expect(coolingDrift.previous_year_kwh).toBeGreaterThan(0);
    expect(coolingDrift.change).toBeCloseTo(0.5, 9);
    for (const d of drift) expect(d.delivered_kwh).toBeGreaterThanOrEqual(0);
  });

  it("a report's data and PDF show cooling delivered per carrier; the signed view stays in the balance", async () => {
    const { reportPeriod } = await app.periods();
    const { loadReportData } = await app.data();
    const { createReportDocument, drawReport, pdfBytes } = await app.pdf();
    const { formatDecimal } = await app.balance();
    const data = await loadReportData({
      organizationId: org.org.id,
      siteId: null,
      period: reportPeriod("month", MONTH),
      reportId: "00000000-0000-4000-8000-00000000c001",
      authorName: "Test",
      generatedAt: new Date(),
    });
    const coolingDelivered = await negated(coolingHeatFlow);

    // No cross-carrier kWh figure: neither for the report nor for a site.
    expect(data).not.toHaveProperty("totals");
    const [site] = data.sites;
    expect(site).not.toHaveProperty("total");
    expect(site.balance).not.toHaveProperty("importsKwh");
    expect(site.balance).not.toHaveProperty("exportsKwh");

    const totals = data.carrierTotals;
    expect(totals.map((t) => t.carrier).sort()).toEqual([
      "cooling",
      "electricity",
      "heat",
    ]);
    for (const t of [...totals, ...site.tables.flatMap((t) => t.entries)]) {
      expect(Number(t.importsKwh)).toBeGreaterThanOrEqual(0);
      expect(Number(t.exportsKwh)).toBeLessThanOrEqual(0);
    }
    expect(totals.find((t) => t.carrier === "cooling")!.importsKwh).toBe(
      coolingDelivered,
    );
    const coolingBalance = site.balance.carriers.find(
      (c) => c.carrier === "cooling",
    )!;
    expect(coolingBalance.importsKwh).toBe(coolingDelivered);

    // The thermodynamic balance: Q + W into the site, signed, from the same
    // boundary hours the ledger sums (cooling delivered counts as Q < 0).
    const { rows } = await pool.query<{ kwh: string }>(
      `select sum(i.energy_kwh)::text as kwh from intervals i
         join meters m on m.organization_id = i.organization_id and m.id = i.meter_id
        where i.organization_id = $1 and m.parent_meter_id is null
          and i.interval_start >= $2::date and i.interval_start < ($2::date + interval '1 month')`,
      [org.org.id, `${MONTH}-01`],
    );
    expect(Number(site.balance.netIntoSiteKwh)).toBeCloseTo(
      Number(rows[0].kwh),
      6,
    );

    const doc = createReportDocument({
      title: "Report",
      subject: org.org.name,
      author: "Test",
    });
    await drawReport(doc, data);
    const bytes = pdfBytes(doc);
    doc.end();
    const file = join(dir, "cooling.pdf");
    writeFileSync(file, await bytes);
    const text = execFileSync("pdftotext", ["-layout", file, "-"], {
      encoding: "utf8",
    }).replace(/\s+/g, " ");
    expect(text).toContain("Cooling delivered");
    expect(text).toContain(formatDecimal(coolingDelivered, 1));
    expect(text).toMatch(/thermodynamic/i);
    expect(text).not.toContain("Net energy per month");
  });
});

describe("a cooling meter's register", () => {
  /** A fresh org with a cooling heat register (`R-<tag>`) that counted 45 kWh of cooling. */
  async function withCoolingRegister() {
    const registerOrg = await createMeteredOrg({
      roles: ["auditor"],
      timeZone: "UTC",
    });
    const [meter] = await db
      .insert(schema.meters)
      .values({
        organizationId: registerOrg.org.id,
        siteId: registerOrg.siteId,
        installedAt: new Date("2020-01-01T00:00:00Z"),
        code: `R-${registerOrg.tag}`,
        name: "Cooling energy register",
        quantity: "heat_register",
        carrier: "cooling",
        orientation: "import",
      })
      .returning({ id: schema.meters.id, code: schema.meters.code });
    const posted = await new Client().postJson(
      "/api/v1/readings",
      {
        readings: [500, 520, 545].map((register_kwh, i) => ({
          meter: meter.code,
          quantity: "heat_register",
          time: `2026-07-01T0${i}:00:00Z`,
          register_kwh,
        })),
      },
      { authorization: `Bearer ${registerOrg.gatewayKey}` },
    );
    expect(await posted.json()).toMatchObject({ accepted: 3, rejected: [] });
    return { registerOrg, meter };
  }

  /** The meter's hours, rollups and wrong-sign hours, read through `on`. */
  const sums = async (
    organizationId: string,
    meterId: string,
    on: Pick<typeof pool, "query"> = pool,
  ) => {
    const { rows } = await on.query<{
      hours: string;
      rollup: string;
      flagged: number;
    }>(
      `select (select sum(energy_kwh) from intervals where organization_id = $1 and meter_id = $2)::text as hours,
              (select sum(energy_kwh) from monthly_rollups where organization_id = $1 and meter_id = $2)::text as rollup,
              (select count(*) from intervals where organization_id = $1 and meter_id = $2
                  and 'wrong_sign' = any(flags))::int as flagged`,
      [organizationId, meterId],
    );
    return rows[0];
  };

  it("counts cooling delivered: stored as heat leaving the site, shown as delivered", async () => {
    const { registerOrg, meter } = await withCoolingRegister();
    expect(await sums(registerOrg.org.id, meter.id)).toEqual({
      hours: "-45.000000",
      rollup: "-45.000000",
      flagged: 0,
    });
    const client = new Client();
    await client.signIn(
      registerOrg.org.members[0].email,
      registerOrg.org.members[0].password,
    );
    const ledger = (await (
      await client.get(
        `/api/v1/orgs/${registerOrg.org.id}/ledger?from=2026-07&to=2026-07`,
      )
    ).json()) as { rows: LedgerRow[] };
    expect(ledger.rows).toMatchObject([
      { carrier: "cooling", imports_kwh: "45.000000", exports_kwh: "0" },
    ]);
  });

  it("hours stored with the register's old sign are turned by migration 0008, rollups still their sums", async () => {
    const { registerOrg, meter } = await withCoolingRegister();
    const migration = readFileSync(
      "drizzle/0008_cooling_registers_signed.sql",
      "utf8",
    ).split("--> statement-breakpoint");
    const client = await pool.connect();
    try {
      // As an earlier version stored them: the register's sign, each
      // measured hour flagged wrong-sign against chilled water's.
      await client.query("begin");
      const args = [registerOrg.org.id, meter.id];
      await client.query(
        `update intervals set energy_kwh = -energy_kwh, flags = array_append(flags, 'wrong_sign')
          where organization_id = $1 and meter_id = $2`,
        args,
      );
      await client.query(
        `update monthly_rollups set energy_kwh = -energy_kwh, estimated_kwh = -estimated_kwh
          where organization_id = $1 and meter_id = $2`,
        args,
      );
      const before = await client.query(
        "select sum(energy_kwh)::text as e from monthly_rollups where organization_id = $1 and meter_id = $2",
        args,
      );
      expect(before.rows[0].e).toBe("45.000000");
      for (const statement of migration) await client.query(statement);
      expect(await sums(registerOrg.org.id, meter.id, client)).toEqual({
        hours: "-45.000000",
        rollup: "-45.000000",
        flagged: 0,
      });
    } finally {
      // The migration ran over the whole test database: leave it as it was.
      await client.query("rollback");
      client.release();
    }
    expect(await sums(registerOrg.org.id, meter.id)).toMatchObject({
      hours: "-45.000000",
    });
  });
});
