/**
 * A metered organisation (tests/support/metered-org.ts) with fifteen full
 * months behind it, so every main page has something to show: heat that
 * follows the degree days, chilled water, electricity in and solar out, daily
 * weather for the site, and a saved heat baseline on the first six months.
 *
 *   const data = await createYearOfData();
 *   await page.goto(`${baseUrl}/o/${data.org.org.id}/weather?${data.weatherQuery}`);
 */
import { eq } from "drizzle-orm";
import { expect } from "vitest";
import { db, schema } from "./db";
import { Client } from "./http";
import {
  createMeteredOrg,
  METERS_INSTALLED_AT,
  type MeteredOrg,
  type MeterRef,
} from "./metered-org";

export interface YearOfData {
  org: MeteredOrg;
  /** The full months with data, oldest first (YYYY-MM). */
  months: string[];
  heat: MeterRef;
  cooling: MeterRef;
  /** The Weather & baselines query that shows the model, savings and EnPIs. */
  weatherQuery: string;
}

const FULL_MONTHS = 15;
const BASE_C = 15.5;

/** YYYY-MM of the month `back` months before this one (UTC). */
function monthBack(back: number): string {
  const now = new Date();
  return new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - back, 1))
    .toISOString()
    .slice(0, 7);
}

function daysIn(month: string): number {
  const [y, m] = month.split("-").map(Number);
  return new Date(Date.UTC(y, m, 0)).getUTCDate();
}

/** A mild seasonal swing: cold in January, warm in July. */
function dailyMean(month: string, day: number): number {
  const m = Number(month.slice(5));
  return 11 - 8 * Math.cos(((m - 1) / 12) * 2 * Math.PI) + ((day % 3) - 1);
}

const round3 = (x: number) => Math.round(x * 1000) / 1000;

export async function createYearOfData(): Promise<YearOfData> {
  const org = await createMeteredOrg({
    roles: ["energy_manager"],
    timeZone: "UTC",
  });
  const { id: orgId } = org.org;
  await db
    .update(schema.sites)
    .set({ floorAreaM2: "1200", degreeDayBaseC: String(BASE_C) })
    .where(eq(schema.sites.id, org.siteId));
  const [heat, cooling] = await db
    .insert(schema.meters)
    .values(
      (["heat", "cooling"] as const).map((carrier) => ({
        organizationId: orgId,
        siteId: org.siteId,
        installedAt: METERS_INSTALLED_AT,
        code: `${carrier === "heat" ? "H" : "K"}-${org.tag}`,
        name: carrier === "heat" ? "Boiler heat register" : "Chilled water",
        quantity: "heat_register" as const,
        carrier,
        orientation: "import" as const,
      })),
    )
    .returning({ id: schema.meters.id, code: schema.meters.code });

  const months = Array.from({ length: FULL_MONTHS }, (_, i) =>
    monthBack(FULL_MONTHS - i),
  );
  const weather: string[] = [];
  const hdd: number[] = [];
  const cdd: number[] = [];
  for (const month of months) {
    let h = 0;
    let c = 0;
    for (let d = 1; d <= daysIn(month); d++) {
      const t = dailyMean(month, d);
      weather.push(`${month}-${String(d).padStart(2, "0")},${t}`);
      h += Math.max(0, BASE_C - t);
      c += Math.max(0, t - BASE_C);
    }
    hdd.push(h);
    cdd.push(c);
  }

  const manager = new Client();
  await manager.signIn(org.org.members[0].email, org.org.members[0].password);
  const form = new FormData();
  form.set("intent", "upload-weather");
  form.set("siteId", org.siteId);
  form.set(
    "file",
    new Blob([["date,mean_temp_c", ...weather].join("\n")], {
      type: "text/csv",
    }),
    "weather.csv",
  );
  const uploaded = await manager.request(`/o/${orgId}/weather`, {
    method: "POST",
    body: form,
  });
  expect(uploaded.status).toBe(200);

  // Register reads at each month start and an hour ago, so the last 30
  // days have hours too. Heat follows the degree days (200 kWh + 30 kWh per
  // degree day); the rest is steady.
  const starts = [...months, monthBack(0)].map((m) => `${m}-01T00:00:00Z`);
  const times = [...starts, new Date(Date.now() - 3_600_000).toISOString()];
  const series = (
    meter: MeterRef,
    quantity: string,
    monthly: (i: number) => number,
  ) => {
    let register = 1000;
    return times.map((time, i) => {
      if (i > 0) register += monthly(Math.min(i - 1, months.length - 1));
      return {
        meter: meter.code,
        quantity,
        time,
        register_kwh: round3(register),
      };
    });
  };
  const readings = [
    ...series(heat, "heat_register", (i) => 200 + 30 * hdd[i]),
    // Less cooling each year, so its change on a year before is down.
    ...series(cooling, "heat_register", (i) => 120 + 25 * cdd[i] - 3 * i),
    ...series(org.meters.register, "electric_register", (i) => 1500 + 40 * i),
    ...series(org.meters.export, "electric_register", (i) => 60 + 5 * i),
  ];
  const posted = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(posted.status).toBe(200);

  const saved = await manager.post(`/o/${orgId}/weather`, {
    intent: "save-baseline",
    siteId: org.siteId,
    carrier: "heat",
    driver: "hdd",
    from: months[0],
    to: months[5],
  });
  expect(saved.status).toBe(200);

  const weatherQuery = new URLSearchParams({
    site: org.siteId,
    carrier: "heat",
    baseFrom: months[0],
    baseTo: months[5],
    reportFrom: months[6],
    reportTo: months[months.length - 1],
  }).toString();
  return { org, months, heat, cooling, weatherQuery };
}
