/**
 * Two priced electricity supplies for the supplier-bill tests: two hourly
 * import meters with a tariff each (flat 0.20 a kWh, 1.00 a day standing, no
 * VAT), two days of readings each in January 2026 (GMT: local time is UTC),
 * and what the meters and the tariff say for January, worked out here.
 */
import Decimal from "decimal.js-light";
import { expect } from "vitest";
import { Client } from "./http";
import type { MeteredOrg } from "./metered-org";

const HOUR = 3_600_000;
const FIRST = Date.parse("2026-01-12T00:00:00Z");
const RATE = "0.20";
const STANDING = "1.00";
const JANUARY_DAYS = 31;

export interface BillSupply {
  code: string;
  tariffName: string;
  /** January 2026, exact decimal text. */
  meteredKwh: string;
  computedCost: string;
}

/** Hour i's kWh at meter `m`: distinct, three decimals. */
const hourKwh = (m: number, i: number) =>
  (2 + m + ((i * 29) % 40) / 8).toFixed(3);

export async function createBillSupplies(
  org: MeteredOrg,
  manager: Client,
): Promise<BillSupply[]> {
  const base = `/api/v1/orgs/${org.org.id}`;
  const supplies: BillSupply[] = [];
  const readings: Record<string, unknown>[] = [];
  for (const m of [0, 1]) {
    const code = `BILL${m}-${org.tag}`;
    const meter = await manager.postJson(`${base}/meters`, {
      site_id: org.siteId,
      code,
      name: code,
      quantity: "electric_work",
      carrier: "electricity",
      orientation: "import",
      interval_minutes: 60,
      installed_at: "2025-12-01",
    });
    expect(meter.status).toBe(201);
    const meterId = ((await meter.json()) as { id: string }).id;
    const tariffName = `Supply ${m + 1} ${org.tag}`;
    const tariff = await manager.postJson(`${base}/tariffs`, {
      name: tariffName,
      site_id: org.siteId,
      carrier: "electricity",
      meter_id: meterId,
      currency: "GBP",
      first_version: {
        valid_from: "2026-01-01",
        rates: {
          bands: [
            {
              name: "All day",
              rate_per_kwh: RATE,
              windows: "Mon-Sun 00:00-00:00",
            },
          ],
          standing_charge_per_day: STANDING,
          vat_percent: "0",
        },
      },
    });
    expect(tariff.status).toBe(201);
    let kwh = new Decimal(0);
    for (let i = 0; i < 48; i++) {
      const value = hourKwh(m, i);
      kwh = kwh.plus(value);
      readings.push({
        meter: code,
        quantity: "interval_energy",
        start: new Date(FIRST + i * HOUR).toISOString(),
        end: new Date(FIRST + (i + 1) * HOUR).toISOString(),
        energy_kwh: Number(value),
      });
    }
    supplies.push({
      code,
      tariffName,
      meteredKwh: kwh.toString(),
      computedCost: kwh
        .times(RATE)
        .plus(new Decimal(STANDING).times(JANUARY_DAYS))
        .toString(),
    });
  }
  const posted = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(posted.status).toBe(200);
  expect(((await posted.json()) as { rejected: unknown[] }).rejected).toEqual(
    [],
  );
  return supplies;
}

/** A bill file's CSV: the first supply's January as metered (agreed), the second's 10 % dearer (queried). */
export function agreedAndQueriedCsv(supplies: BillSupply[]): string {
  const [a, b] = supplies;
  return [
    "supply,period_from,period_to,kwh,amount,read_type",
    `${a.code},2026-01-01,2026-01-31,${a.meteredKwh},${a.computedCost},actual`,
    `${b.tariffName},2026-01-01,2026-01-31,${b.meteredKwh},${new Decimal(b.computedCost).times("1.1").toString()},estimated`,
  ].join("\n");
}
