import { readFileSync } from "node:fs";
import Papa from "papaparse";
import { eq } from "drizzle-orm";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, signInPage } from "../support/browser";
import { db, pool, schema } from "../support/db";
import { addCoolingMeter, createMeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

describe("the Ledger page", () => {
  it("shows the database's totals per carrier, cooling delivered positive, exports CSV and closes a month", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    const cooling = await addCoolingMeter(org);
    const reads = [
      ...[0, 1, 2, 3, 4].map((h) => ({
        meter: org.meters.register.code,
        quantity: "electric_register",
        time: `2026-09-15T0${h}:00:00Z`,
        register_kwh: 2000 + h * h * 10.25,
      })),
      {
        meter: cooling.code,
        quantity: "water_heat",
        start: "2026-09-15T12:00:00Z",
        end: "2026-09-15T13:00:00Z",
        volume_m3: 5,
        flow_temp_c: 6,
        return_temp_c: 12,
      },
    ];
    const posted = await fetch(`${baseUrl}/api/v1/readings`, {
      method: "POST",
      headers: {
        authorization: `Bearer ${org.gatewayKey}`,
        "content-type": "application/json",
      },
      body: JSON.stringify({ readings: reads }),
    });
    expect(posted.status).toBe(200);
    const rollup = async (meterId: string) => {
      const { rows } = await pool.query<{ kwh: string }>(
        "select sum(energy_kwh)::text as kwh from monthly_rollups where organization_id = $1 and meter_id = $2",
        [org.org.id, meterId],
      );
      return Number(rows[0].kwh);
    };
    const net = await rollup(org.meters.register.id); // 16 × 10.25 = 164 kWh
    // Stored as heat leaving the site (about −35 kWh); delivered as cooling.
    const heatFlow = await rollup(cooling.id);
    expect(heatFlow).toBeLessThan(0);
    const oneDecimal = (kwh: number) =>
      kwh.toLocaleString("en-GB", {
        minimumFractionDigits: 1,
        maximumFractionDigits: 1,
      });

    const page = await signInPage(
      chromium.browser,
      baseUrl,
      org.org.members[0],
      {
        viewport: { width: 1366, height: 900 },
      },
    );
    await page.goto(
      `${baseUrl}/o/${org.org.id}/ledger?from=2026-09&to=2026-09`,
    );
    // One totals row per carrier, none over both.
    const totalRow = page.locator('[row-id="total|electricity"]').first();
    await totalRow.getByText("Total").waitFor();
    expect(await totalRow.textContent()).toContain(oneDecimal(net));
    const coolingTotal = await page
      .locator('[row-id="total|cooling"]')
      .first()
      .textContent();
    expect(coolingTotal).toContain(oneDecimal(-heatFlow));
    expect(coolingTotal).not.toContain("\u2212");
    expect(await page.locator('[row-id="total"]').count()).toBe(0);
    await page.getByText("Delivered (kWh)").first().waitFor();

    // The exports follow the screen: the unit chosen and the filters.
    await page.getByLabel("Unit").selectOption("MWh");
    await page.getByText("Delivered (MWh)").first().waitFor();
    const exportLink = page.getByRole("link", { name: "Export CSV" });
    await expect
      .poll(async () => await exportLink.getAttribute("href"))
      .toContain("unit=MWh");
    const href = new URL((await exportLink.getAttribute("href"))!, baseUrl);
    expect(Object.fromEntries(href.searchParams)).toEqual({
      from: "2026-09",
      to: "2026-09",
      unit: "MWh",
    });
    expect(
      await page
        .getByRole("link", { name: "Export XLSX" })
        .getAttribute("href"),
    ).toContain("unit=MWh");

    const [download] = await Promise.all([
      page.waitForEvent("download"),
      exportLink.click(),
    ]);
    const csv = Papa.parse<Record<string, string>>(
      readFileSync((await download.path())!, "utf8"),
      { header: true, skipEmptyLines: true },
    );
    // Two entries, then one total row per carrier.
    expect(csv.data).toHaveLength(4);
    const line = (carrier: string) =>
      csv.data.find((l) => l.Carrier === carrier && l.Site !== "Total")!;
    expect(Number(line("Electricity")["Net (MWh)"])).toBeCloseTo(net / 1000, 9);
    expect(Number(line("Cooling")["Delivered (MWh)"])).toBeCloseTo(
      -heatFlow / 1000,
      9,
    );
    expect(
      csv.data.filter((l) => l.Site === "Total").map((l) => l.Carrier),
    ).toEqual(["Cooling", "Electricity"]);

    // A carrier filter goes into the links too.
    await page.getByLabel("Carrier", { exact: true }).selectOption("cooling");
    await expect
      .poll(async () => await exportLink.getAttribute("href"))
      .toContain("carrier=cooling");
    expect(await exportLink.getAttribute("href")).toContain("unit=MWh");

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
