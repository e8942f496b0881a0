/**
 * Budgets and the carbon target over the API: a budget's monthly spread adds
 * up to the annual amounts exactly; the year's progress carries, for each
 * month, the ledger's delivered kWh and cost of the site and carrier as the
 * actual; an auditor reads but may not write (403); another organisation
 * gets 404; bad input is refused (400) with the reason and stores nothing.
 */
import Decimal from "decimal.js-light";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyAppTestEnv } from "../support/app-env";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

applyAppTestEnv();

// The signed report's budgets are loaded in this process, as report jobs do.
const app = {
  periods: () => import("../../app/reports/periods"),
  data: () => import("../../app/reports/report-data.server"),
  client: () => import("../../app/db/client.server"),
};

afterAll(async () => {
  await pool.end();
  await (await app.client()).pool.end();
});

type Json = Record<string, unknown>;
const HALF_HOUR = 1_800_000;
/** Four days either side of 1 March 2026 (GMT): two months with energy. */
const FIRST = Date.parse("2026-02-26T00:00:00Z");
const DAYS = 4;

interface BudgetAnswer {
  id: string;
  energy_kwh: string;
  amount: string | null;
  months: { month: string; energy_kwh: string; amount: string | null }[];
}
interface ProgressMonth {
  month: string;
  budget: string;
  actual: string | null;
  forecast: string;
}
interface ProgressAnswer {
  year: number;
  budgets: {
    budget: { id: string; carrier: string };
    energy: {
      months: ProgressMonth[];
      budget: string;
      actualToDate: string;
      forecast: string;
    };
    money: { months: ProgressMonth[]; budget: string; forecast: string } | null;
  }[];
  carbon: { target: Json } | null;
}

const sum = (values: string[]) =>
  values.reduce((s, v) => s.plus(v), new Decimal(0));

describe("budgets and the carbon target", () => {
  let org: MeteredOrg;
  let other: Awaited<ReturnType<typeof createOrganization>>;
  let manager: Client;
  let auditor: Client;
  let stranger: Client;
  let base: string;

  const budget = (over: Json = {}) => ({
    site_id: org.siteId,
    carrier: "electricity",
    financial_year: 2026,
    energy_kwh: "1000000.000001",
    amount: "250000.07",
    currency: "GBP",
    spread: "flat",
    ...over,
  });
  const storedBudgets = async () =>
    db
      .select()
      .from(schema.budgets)
      .where(eq(schema.budgets.organizationId, org.org.id));

  beforeAll(async () => {
    await db.delete(schema.signInAttempts);
    org = await createMeteredOrg({ roles: ["energy_manager", "auditor"] });
    other = await createOrganization(["energy_manager"]);
    manager = new Client();
    await manager.signIn(org.org.members[0].email, org.org.members[0].password);
    auditor = new Client();
    await auditor.signIn(org.org.members[1].email, org.org.members[1].password);
    stranger = new Client();
    await stranger.signIn(other.members[0].email, other.members[0].password);
    base = `/api/v1/orgs/${org.org.id}`;
    const code = `BI-${org.tag}`;
    const meter = await manager.postJson(`${base}/meters`, {
      site_id: org.siteId,
      code,
      name: code,
      quantity: "electric_work",
      carrier: "electricity",
      orientation: "import",
      interval_minutes: 30,
      installed_at: "2026-01-01",
    });
    expect(meter.status).toBe(201);
    const readings = Array.from({ length: DAYS * 48 }, (_, i) => ({
      meter: code,
      quantity: "interval_energy",
      start: new Date(FIRST + i * HALF_HOUR).toISOString(),
      end: new Date(FIRST + (i + 1) * HALF_HOUR).toISOString(),
      energy_kwh: Number((1 + ((i * 37) % 50) / 8).toFixed(3)),
    }));
    const posted = await new Client().postJson(
      "/api/v1/readings",
      { readings },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(posted.status).toBe(200);
    const tariff = await manager.postJson(`${base}/tariffs`, {
      name: "Grid supply",
      site_id: org.siteId,
      carrier: "electricity",
      meter_id: null,
      currency: "GBP",
      first_version: {
        valid_from: "2026-01-01",
        rates: {
          bands: [
            {
              name: "All",
              rate_per_kwh: "0.2713",
              windows: "Mon-Sun 00:00-24:00",
            },
          ],
          standing_charge_per_day: "1.31",
          vat_percent: "20",
        },
      },
    });
    expect(tariff.status, await tariff.clone().text()).toBe(201);
  });

  it("refuses bad input with the reason and stores nothing", async () => {
    const cases: [Json, RegExp][] = [
      [{ energy_kwh: "-5" }, /energy_kwh/],
      [{ amount: "10.001" }, /amount/],
      [{ currency: null }, /currency/],
      [{ spread: "evenly" }, /spread/],
      [{ site_id: other.id }, /No such site/],
      [{ financial_year: 1900 }, /financial year/i],
    ];
    for (const [over, reason] of cases) {
      const r = await manager.postJson(`${base}/budgets`, budget(over));
      expect(r.status, JSON.stringify(over)).toBe(400);
      expect(JSON.stringify(await r.json())).toMatch(reason);
    }
    const target = await manager.postJson(`${base}/carbon-target`, {
      base_year: 2026,
      target_year: 2026,
      reduction_percent: "10",
      basis: "location",
    });
    expect(target.status).toBe(400);
    expect(JSON.stringify(await target.json())).toMatch(/after the base year/);
    expect(await storedBudgets()).toEqual([]);
    const none = await manager.request(`${base}/carbon-target`);
    expect(await none.json()).toEqual({ target: null });
  });

  it("an auditor reads but may not write; another organisation gets 404", async () => {
    expect((await auditor.postJson(`${base}/budgets`, budget())).status).toBe(
      403,
    );
    expect(
      (
        await auditor.postJson(`${base}/carbon-target`, {
          base_year: 2025,
          target_year: 2026,
          reduction_percent: "10",
          basis: "location",
        })
      ).status,
    ).toBe(403);
    expect((await auditor.request(`${base}/budgets`)).status).toBe(200);
    expect((await stranger.request(`${base}/budgets`)).status).toBe(404);
    expect((await stranger.postJson(`${base}/budgets`, budget())).status).toBe(
      404,
    );
    expect(await storedBudgets()).toEqual([]);
  });

  it("spreads exactly, and the actuals are the ledger's sums", async () => {
    for (const spread of ["flat", "degree_days"]) {
      const saved = await manager.postJson(
        `${base}/budgets`,
        budget({ spread }),
      );
      expect(saved.status).toBe(201);
      const b = (await saved.json()) as BudgetAnswer;
      expect(b.months).toHaveLength(12);
      expect(sum(b.months.map((m) => m.energy_kwh)).eq(b.energy_kwh)).toBe(
        true,
      );
      expect(sum(b.months.map((m) => m.amount!)).eq("250000.07")).toBe(true);
    }
    // Saving again replaced the budget: one row, two audit entries.
    expect(await storedBudgets()).toHaveLength(1);
    const audit = await db
      .select()
      .from(schema.auditLog)
      .where(eq(schema.auditLog.organizationId, org.org.id));
    expect(audit.filter((a) => a.action === "budget.saved")).toHaveLength(2);

    const target = await manager.postJson(`${base}/carbon-target`, {
      base_year: 2025,
      target_year: 2026,
      reduction_percent: "12.5",
      basis: "location",
    });
    expect(target.status).toBe(201);

    const ledgerReply = await manager.request(
      `${base}/ledger?from=2026-01&to=2026-12`,
    );
    const ledger = (await ledgerReply.json()) as {
      rows: {
        month: string;
        carrier: string;
        imports_kwh: string;
        cost: string | null;
        adjustments_cost: string | null;
      }[];
    };
    const electricity = ledger.rows.filter((r) => r.carrier === "electricity");
    expect(electricity.map((r) => r.month)).toEqual(["2026-02", "2026-03"]);

    const reply = await manager.request(
      `${base}/budgets/progress?financial_year=2026`,
    );
    expect(reply.status).toBe(200);
    const progress = (await reply.json()) as ProgressAnswer;
    expect(progress.year).toBe(2026);
    expect(progress.carbon?.target).toMatchObject({
      reduction_percent: "12.50",
    });
    const [one] = progress.budgets;
    for (const row of electricity) {
      const energy = one.energy.months.find((m) => m.month === row.month)!;
      const money = one.money!.months.find((m) => m.month === row.month)!;
      expect(new Decimal(energy.actual!).eq(row.imports_kwh)).toBe(true);
      expect(
        new Decimal(money.actual!).eq(
          new Decimal(row.cost!).plus(row.adjustments_cost ?? 0),
        ),
      ).toBe(true);
      expect(new Decimal(row.cost!).gt(0)).toBe(true);
    }
    // Months without energy to date are actual zero, not budget.
    const january = one.energy.months.find((m) => m.month === "2026-01")!;
    expect(january.actual).toBeNull();
    expect(january.forecast).toBe("0.000");

    // The signed report of the financial year carries the same figures.
    const { reportPeriod } = await app.periods();
    const { loadReportData } = await app.data();
    const report = await loadReportData({
      organizationId: org.org.id,
      siteId: null,
      period: reportPeriod("year", "2026"),
      reportId: "00000000-0000-4000-8000-00000000b0d9",
      authorName: "Budget test",
      generatedAt: new Date(),
    });
    expect(report.budgets.rows).toEqual([
      expect.objectContaining({
        carrier: one.budget.carrier,
        budgetKwh: one.energy.budget,
        actualKwhToDate: one.energy.actualToDate,
        forecastKwh: one.energy.forecast,
        money: expect.objectContaining({
          budget: one.money!.budget,
          forecast: one.money!.forecast,
        }),
      }),
    ]);
    expect(report.budgets.carbon).toMatchObject({
      reductionPercent: "12.50",
      baseYear: 2025,
    });
  });
});
