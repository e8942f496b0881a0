import { readFileSync } from "node:fs";
import { eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchBrowser, signInPage } from "../support/browser";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
let browser: Browser;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await pool.end();
});

describe("the Ledger page", () => {
  it("shows the database's totals, exports CSV and closes a month", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    const reads = [0, 1, 2, 3, 4].map((h) => ({
      meter: org.meters.register.code,
      quantity: "electric_register",
      time: `2026-09-15T0${h}:00:00Z`,
      register_kwh: 2000 + h * h * 10.25,
    }));
    const posted = await fetch(`${baseUrl}/api/v1/readings`, {
      method: "POST",
      headers: {
        authorization: `Bearer ${org.gatewayKey}`,
        "content-type": "application/json",
      },
      body: JSON.stringify({ readings: reads }),
    });
    expect(posted.status).toBe(200);
    const { rows } = await pool.query<{ net: string }>(
      "select sum(energy_kwh)::text as net from monthly_rollups where organization_id = $1",
      [org.org.id],
    );
    const net = Number(rows[0].net); // 16 × 10.25 = 164 kWh

    const page = await signInPage(browser, baseUrl, org.org.members[0], {
      viewport: { width: 1366, height: 900 },
    });
    await page.goto(
      `${baseUrl}/o/${org.org.id}/ledger?from=2026-09&to=2026-09`,
    );
    const totalRow = page.locator('[row-id="total"]').first();
    await totalRow.getByText("Total").waitFor();
    expect(await totalRow.textContent()).toContain(
      net.toLocaleString("en-GB", {
        minimumFractionDigits: 1,
        maximumFractionDigits: 1,
      }),
    );

    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByRole("link", { name: "Export CSV" }).click(),
    ]);
    const csv = readFileSync((await download.path())!, "utf8")
      .trim()
      .split("\n");
    expect(csv).toHaveLength(2);
    expect(Number(csv[1].split(",")[5])).toBe(net);

    await page.getByLabel("Month to close").fill("2026-09");
    await page.getByRole("button", { name: "Close month" }).click();
    await page
      .getByText(/closed/i)
      .first()
      .waitFor();
    const closes = () =>
      db
        .select({
          month: schema.monthCloses.month,
          reopenedAt: schema.monthCloses.reopenedAt,
        })
        .from(schema.monthCloses)
        .where(eq(schema.monthCloses.organizationId, org.org.id));
    await expect
      .poll(closes, { timeout: 10_000 })
      .toEqual([{ month: "2026-09-01", reopenedAt: null }]);
    await page.close();
  });
});
