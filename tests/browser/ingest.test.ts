import { randomUUID } from "node:crypto";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, mainNav, signInPage } from "../support/browser";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

const signInAsManager = () =>
  signInPage(chromium.browser, baseUrl, { email: "manager@larchmere.example" });
const nav = mainNav;

describe("from an empty site to readings on screen", () => {
  it("creates a site, a meter and a gateway, posts readings with the key and sees them", async () => {
    const tag = randomUUID().slice(0, 6);
    const page = await signInAsManager();

    await nav(page).getByRole("link", { name: "Sites" }).click();
    await page.getByLabel("Name").fill(`Test Pavilion ${tag}`);
    await page.getByLabel("Floor area (m²)").fill("850");
    await page.getByRole("button", { name: "Add site" }).click();
    await page
      .getByRole("heading", { level: 1, name: `Test Pavilion ${tag}` })
      .waitFor();

    await page.getByRole("link", { name: "Add a meter" }).click();
    const code = `TP-EL-${tag}`;
    await page.getByLabel("Code").fill(code);
    await page.getByLabel("Name").fill("Pavilion supply");
    await page.getByLabel("Measures").selectOption("electric_register");
    await page.getByLabel("Energy carrier").selectOption("electricity");
    await page.getByLabel("Installed on").fill("2026-01-01");
    await page.getByRole("button", { name: "Add meter" }).click();
    await page.getByRole("heading", { name: "Boundary" }).waitFor();
    expect(await page.getByRole("cell", { name: code }).count()).toBe(1);

    await nav(page).getByRole("link", { name: "Gateways" }).click();
    await page.getByLabel("Gateway name").fill(`Pavilion gateway ${tag}`);
    await page.getByRole("button", { name: "Create and show key" }).click();
    const key = (await page
      .getByTestId("new-gateway-key")
      .textContent())!.trim();
    expect(key).toMatch(/^jbgw_/);

    const reads = [0, 1, 2, 3].map((h) => ({
      meter: code,
      quantity: "electric_register",
      time: `2026-11-02T0${h}:00:00Z`,
      register_kwh: 1000 + h * 12.5,
    }));
    const response = await fetch(`${baseUrl}/api/v1/readings`, {
      method: "POST",
      headers: {
        authorization: `Bearer ${key}`,
        "content-type": "application/json",
      },
      body: JSON.stringify({ readings: reads }),
    });
    expect(response.status).toBe(200);
    expect(await response.json()).toMatchObject({
      accepted: 4,
      repeats: 0,
      rejected: [],
    });

    await nav(page).getByRole("link", { name: "Readings" }).click();
    await page.getByRole("link", { name: new RegExp(code) }).click();
    await page.getByRole("heading", { name: "Intervals" }).waitFor();
    // Three hourly deltas of 12.5 kWh between four register reads.
    await page.getByText("37.5 kWh").first().waitFor();
    expect(await page.getByRole("gridcell", { name: "12.5" }).count()).toBe(3);
    await page.close();
  });
});
