import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, signInPage } from "../support/browser";
import { db, schema } from "../support/db";
import { createMeteredOrg, METERS_INSTALLED_AT } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

describe("a half-hourly meter's pages", () => {
  it("say the resolution, list the half-hours in the table and correct one of them", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    const code = `HH-${org.tag}`;
    const [meter] = await db
      .insert(schema.meters)
      .values({
        organizationId: org.org.id,
        siteId: org.siteId,
        installedAt: METERS_INSTALLED_AT,
        code,
        name: `Supplier half-hours ${code}`,
        quantity: "electric_work",
        carrier: "electricity",
        orientation: "import",
        intervalMinutes: 30,
      })
      .returning({ id: schema.meters.id });
    // Twelve half-hours on 10 March 2026 (Europe/London is on UTC then).
    const readings = Array.from({ length: 12 }, (_, i) => {
      const start = Date.parse("2026-03-10T00:00:00Z") + i * 30 * 60_000;
      return {
        meter: code,
        quantity: "interval_energy",
        start: new Date(start).toISOString(),
        end: new Date(start + 30 * 60_000).toISOString(),
        energy_kwh: 5 + i / 10,
      };
    });
    const response = await fetch(`${baseUrl}/api/v1/readings`, {
      method: "POST",
      headers: {
        authorization: `Bearer ${org.gatewayKey}`,
        "content-type": "application/json",
      },
      body: JSON.stringify({ readings }),
    });
    expect(response.status).toBe(200);

    const page = await signInPage(
      chromium.browser,
      baseUrl,
      org.org.members[0],
    );
    await page.goto(`${baseUrl}/o/${org.org.id}/meters/${meter.id}`);
    await page.getByText(/· Half-hourly ·/).waitFor();

    await page.goto(`${baseUrl}/o/${org.org.id}/meters/${meter.id}/readings`);
    await page.getByText("Half-hourly intervals at").waitFor();
    // The table lists each half-hour, so a half-hour can be corrected.
    await page.getByRole("gridcell", { name: "10 Mar 2026, 03:30" }).click();
    const panel = page.getByRole("region", { name: "Correct an interval" });
    await expect
      .poll(() => panel.textContent(), { timeout: 15_000 })
      .toMatch(/now 5\.7 kWh, actual reading/);
    await panel.getByLabel(/Corrected energy/).fill("5.75");
    await panel.getByLabel("Reason").fill("Supplier re-issued the file");
    await panel.getByRole("button", { name: "Save correction" }).click();
    await expect
      .poll(() => panel.textContent(), { timeout: 15_000 })
      .toContain("now 5.75 kWh, corrected by hand");
    await page.close();
  });
});
