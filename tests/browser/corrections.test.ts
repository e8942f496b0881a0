import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, signInPage } from "../support/browser";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

/** Six hours of heating water on 10 March 2026, 00:00 to 05:00 UTC. */
async function postHeat(org: MeteredOrg) {
  const readings = [0, 1, 2, 3, 4, 5].map((h) => ({
    meter: org.meters.water.code,
    quantity: "water_heat",
    start: `2026-03-10T0${h}:00:00Z`,
    end: `2026-03-10T0${h + 1}:00:00Z`,
    volume_m3: 2 + h / 10,
    flow_temp_c: 75,
    return_temp_c: 50,
  }));
  const response = await fetch(`${baseUrl}/api/v1/readings`, {
    method: "POST",
    headers: {
      authorization: `Bearer ${org.gatewayKey}`,
      "content-type": "application/json",
    },
    body: JSON.stringify({ readings }),
  });
  expect(response.status).toBe(200);
}

const panel = (page: Page) =>
  page.getByRole("region", { name: "Correct an interval" });

describe("correcting an hour on the meter's readings page", () => {
  it("shows the new value after saving, and asks before storing a jump far outside the meter's history", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    await postHeat(org);
    const page = await signInPage(
      chromium.browser,
      baseUrl,
      org.org.members[0],
    );
    await page.goto(
      `${baseUrl}/o/${org.org.id}/meters/${org.meters.water.id}/readings`,
    );
    // Europe/London is on UTC in early March.
    await page.getByRole("gridcell", { name: "10 Mar 2026, 03:00" }).click();
    await expect
      .poll(() => panel(page).textContent(), { timeout: 15_000 })
      .toMatch(/now [\d.,]+ kWh, actual reading/);

    await panel(page)
      .getByLabel(/Corrected energy/)
      .fill("60.5");
    await panel(page).getByLabel("Reason").fill("Checked against the site log");
    await panel(page).getByRole("button", { name: "Save correction" }).click();
    await expect
      .poll(() => panel(page).textContent(), { timeout: 15_000 })
      .toContain("now 60.5 kWh, corrected by hand");
    expect(
      await page.getByRole("gridcell", { name: "60.5", exact: true }).count(),
    ).toBe(1);

    // Far beyond ten times this meter's typical hour: named, then confirmed.
    await panel(page)
      .getByLabel(/Corrected energy/)
      .fill("250000");
    await panel(page).getByLabel("Reason").fill("Register photo shows this");
    await panel(page).getByRole("button", { name: "Save correction" }).click();
    await panel(page)
      .getByText(/250,000 kWh is [\d,]+ × this meter's typical interval of/)
      .waitFor();
    expect(await panel(page).textContent()).toContain(
      "now 60.5 kWh, corrected by hand",
    );
    await panel(page)
      .getByLabel(/Yes, 250,000 kWh is right/)
      .check();
    await panel(page).getByRole("button", { name: "Save correction" }).click();
    await expect
      .poll(() => panel(page).textContent(), { timeout: 15_000 })
      .toContain("now 250,000 kWh, corrected by hand");
    await page.getByRole("gridcell", { name: "confirmed_spike" }).waitFor();
    await page.close();
  });
});
