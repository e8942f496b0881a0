/**
 * The meter readings page says "Live" only while readings keep arriving; a
 * meter whose newest reading is days old is shown as such, in plain words.
 */
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchBrowser, signInPage } from "../support/browser";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const HOUR_MS = 3_600_000;
let browser: Browser;
let org: MeteredOrg;

/** The start of the hour `h` hours before the current one. */
const hoursAgo = (h: number) =>
  new Date(Math.floor(Date.now() / HOUR_MS) * HOUR_MS - h * HOUR_MS);

async function post(readings: unknown[]) {
  const response = await fetch(`${baseUrl}/api/v1/readings`, {
    method: "POST",
    headers: {
      authorization: `Bearer ${org.gatewayKey}`,
      "content-type": "application/json",
    },
    body: JSON.stringify({ readings }),
  });
  expect(response.status).toBe(200);
  expect(await response.json()).toMatchObject({ rejected: [] });
}

const heatHour = (start: Date) => ({
  meter: org.meters.water.code,
  quantity: "water_heat",
  start: start.toISOString(),
  end: new Date(start.getTime() + HOUR_MS).toISOString(),
  volume_m3: 1.2,
  flow_temp_c: 70,
  return_temp_c: 45,
});

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  browser = await launchBrowser();
  org = await createMeteredOrg({ roles: ["energy_manager"] });
  // The heat meter's newest hour ended just now; the register last read
  // three days ago.
  await post([heatHour(hoursAgo(2)), heatHour(hoursAgo(1))]);
  await post(
    [75, 74, 73, 72].map((h, i) => ({
      meter: org.meters.register.code,
      quantity: "electric_register",
      time: hoursAgo(h).toISOString(),
      register_kwh: 100 + 10 * i,
    })),
  );
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await pool.end();
});

async function statusOf(meterId: string): Promise<string> {
  const [member] = org.org.members;
  const page = await signInPage(browser, baseUrl, member);
  await page.goto(`${baseUrl}/o/${org.org.id}/meters/${meterId}/readings`);
  const status = page.getByRole("status").filter({ hasText: "updated" });
  await status.waitFor();
  const text = (await status.textContent())!;
  await page.close();
  return text;
}

describe("the readings page's status line", () => {
  it("says Live for a meter whose newest reading ended within the last hours", async () => {
    expect(await statusOf(org.meters.water.id)).toMatch(
      /^Live · updated \d\d:\d\d:\d\d$/,
    );
  });

  it("says when the last reading was for a meter that stopped days ago, not Live", async () => {
    const text = await statusOf(org.meters.register.id);
    expect(text).not.toContain("Live");
    expect(text).toMatch(
      /^Last reading 3 days ago \(\d{1,2} [A-Z][a-z]{2} \d{4}, \d\d:\d\d\) · updated/,
    );
  });
});
