import Decimal from "decimal.js-light";
import { eq } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

const Exact = Decimal.clone({ precision: 80 });
const times = (a: string, b: string) => new Exact(a).times(b);
const sum = (values: (string | null)[]) =>
  values.reduce((s, v) => s.plus(v ?? 0), new Exact(0));

/** Hourly register reads from `start` for `hours` hours, with uneven steps (three decimals). */
function registerSeries(code: string, start: string, hours: number) {
  const t0 = new Date(start).getTime();
  let value = 1000;
  return Array.from({ length: hours + 1 }, (_, i) => {
    if (i > 0) value += 1 + ((i * 7) % 5) * 0.137;
    return {
      meter: code,
      quantity: "electric_register",
      time: new Date(t0 + i * 3_600_000).toISOString(),
      register_kwh: Math.round(value * 1000) / 1000,
    };
  });
}

async function signedIn(org: MeteredOrg, index: number) {
  const client = new Client();
  await client.signIn(
    org.org.members[index].email,
    org.org.members[index].password,
  );
  return client;
}

interface Row {
  month: string;
  carrier: string;
  imports_kwh: string;
  status: string;
  co2e_kg: string | null;
  co2e_market_kg: string | null;
  co2e_adjustments_kg: string;
}
interface LedgerAnswer {
  rows: Row[];
  totals: { carrier: string; co2e_kg: string | null }[];
  carbon_total: {
    co2e_kg: string;
    co2e_market_kg: string;
    rows_without_factor: number;
  };
}

const electricity2025 = (location: string) => ({
  year: 2025,
  carrier: "electricity",
  location_kg_per_kwh: location,
  market_kg_per_kwh: "0.36",
  scope3_kg_per_kwh: "0.059",
  source: "Test factors for an integration test",
  version: "t1",
});

describe("emission factors and carbon in the ledger", () => {
  it("carries exact CO2e on every row, refuses bad writes, and adjusts a closed month", async () => {
    const org = await createMeteredOrg({
      roles: ["energy_manager", "auditor"],
    });
    const other = await createMeteredOrg({ roles: ["owner"] });
    const manager = await signedIn(org, 0);
    const auditor = await signedIn(org, 1);
    const stranger = await signedIn(other, 0);
    const factorsUrl = `/api/v1/orgs/${org.org.id}/emission-factors`;

    // Electricity across the end of January into February (Europe/London), and some solar export.
    const posted = await new Client().postJson(
      "/api/v1/readings",
      {
        readings: [
          ...registerSeries(
            org.meters.register.code,
            "2025-01-31T18:00:00Z",
            30,
          ),
          ...registerSeries(org.meters.export.code, "2025-01-31T20:00:00Z", 10),
        ],
      },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(posted.status).toBeLessThan(300);

    // Refused: no source; an auditor writing; another organisation's member.
    const noSource = await manager.postJson(factorsUrl, {
      sets: [{ ...electricity2025("0.177"), source: "  " }],
    });
    expect(noSource.status).toBe(400);
    expect(JSON.stringify(await noSource.json())).toMatch(/source/i);
    expect(
      (await auditor.postJson(factorsUrl, { sets: [electricity2025("0.177")] }))
        .status,
    ).toBe(403);
    expect((await stranger.get(factorsUrl)).status).toBe(404);
    expect(
      (await stranger.postJson(factorsUrl, { sets: [electricity2025("0.1")] }))
        .status,
    ).toBe(404);
    const stored = await db
      .select()
      .from(schema.emissionFactorSets)
      .where(eq(schema.emissionFactorSets.organizationId, org.org.id));
    expect(stored).toHaveLength(0);

    const saved = await manager.postJson(factorsUrl, {
      sets: [electricity2025("0.177")],
    });
    expect(saved.status).toBe(201);
    const read = await auditor.get(factorsUrl);
    expect(read.status).toBe(200);
    expect((await read.json()).sets).toMatchObject([
      {
        year: 2025,
        carrier: "electricity",
        scope: 2,
        source: "Test factors for an integration test",
      },
    ]);
    const audit = await db
      .select()
      .from(schema.auditLog)
      .where(eq(schema.auditLog.organizationId, org.org.id));
    expect(audit.map((a) => a.action)).toContain("emission_factors.saved");

    // A zero-carbon contract on the supply for February only.
    const contract = await manager.postJson(
      `/api/v1/orgs/${org.org.id}/emission-contracts`,
      {
        meter_id: org.meters.register.id,
        name: "Zero-carbon contract",
        kg_per_kwh: "0",
        valid_from: "2025-02",
        valid_to: "2025-02",
      },
    );
    expect(contract.status).toBe(201);

    const ledger = async () => {
      const response = await auditor.get(
        `/api/v1/orgs/${org.org.id}/ledger?from=2025-01&to=2025-02`,
      );
      expect(response.status).toBe(200);
      return (await response.json()) as LedgerAnswer;
    };
    const first = await ledger();
    expect(first.rows.map((r) => r.month)).toEqual(["2025-01", "2025-02"]);
    for (const row of first.rows) {
      // Delivered energy only: the export is not netted off.
      expect(row.co2e_kg).toBe(times(row.imports_kwh, "0.177").toFixed());
    }
    const [jan, feb] = first.rows;
    expect(jan.co2e_market_kg).toBe(times(jan.imports_kwh, "0.36").toFixed());
    expect(feb.co2e_market_kg).toBe("0");
    expect(first.carbon_total.co2e_kg).toBe(
      sum(first.rows.map((r) => r.co2e_kg)).toFixed(),
    );
    expect(first.carbon_total.co2e_market_kg).toBe(
      sum(first.rows.map((r) => r.co2e_market_kg)).toFixed(),
    );
    expect(first.totals[0].co2e_kg).toBe(first.carbon_total.co2e_kg);

    // Close January, then change the factor: January keeps its closed carbon,
    // the difference is an adjusting entry; February (open) moves.
    await db.insert(schema.monthCloses).values({
      organizationId: org.org.id,
      siteId: null,
      month: "2025-01-01",
    });
    const changed = await manager.postJson(factorsUrl, {
      sets: [electricity2025("0.2")],
    });
    expect(changed.status).toBe(201);
    expect((await changed.json()).adjusted_months).toBe(1);
    const after = await ledger();
    const [janAfter, febAfter] = after.rows;
    expect(janAfter.status).toBe("closed");
    expect(janAfter.co2e_kg).toBe(jan.co2e_kg);
    expect(janAfter.co2e_adjustments_kg).toBe(
      times(jan.imports_kwh, "0.023").toFixed(),
    );
    expect(febAfter.co2e_kg).toBe(times(feb.imports_kwh, "0.2").toFixed());
    expect(after.carbon_total.co2e_kg).toBe(
      sum(after.rows.map((r) => r.co2e_kg)).toFixed(),
    );
  });
});
