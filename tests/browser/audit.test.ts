/**
 * The Audit trail page as an owner uses it: reached from the navigation,
 * filtered, exported, and opened from an adjusted row of the Ledger; an
 * energy manager neither sees it in the navigation nor opens it.
 */
import { readFileSync } from "node:fs";
import Papa from "papaparse";
import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, mainNav, signInPage } from "../support/browser";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

const read = (org: MeteredOrg, hour: number, kwh: number) => ({
  meter: org.meters.register.code,
  quantity: "electric_register",
  time: `2026-09-15T${String(hour).padStart(2, "0")}:00:00Z`,
  register_kwh: kwh,
});

async function postReadings(org: MeteredOrg, readings: unknown[]) {
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(response.status).toBe(200);
}

/** The grid's rows in the order shown (ag-grid numbers them), as their text. */
async function gridRows(page: Page): Promise<string[]> {
  const rows = await page
    .locator("[row-id][row-index]")
    .evaluateAll((elements) =>
      elements.map((e) => [
        Number(e.getAttribute("row-index")),
        e.textContent ?? "",
      ]),
    );
  return rows
    .sort(([a], [b]) => Number(a) - Number(b))
    .map(([, text]) => String(text));
}

describe("the Audit trail page", () => {
  it("an owner filters it, exports it and opens a closed month's adjustments from the Ledger", async () => {
    const org = await createMeteredOrg({ roles: ["owner", "energy_manager"] });
    const [owner, manager] = org.org.members;
    // September closed by the manager, then a late reading adjusts it.
    await postReadings(org, [read(org, 0, 2000), read(org, 2, 2010)]);
    const managerClient = new Client();
    await managerClient.signIn(manager.email, manager.password);
    const closed = await managerClient.post(`/o/${org.org.id}/ledger`, {
      intent: "close",
      month: "2026-09",
      siteId: "",
    });
    expect(closed.status).toBe(200);
    await postReadings(org, [read(org, 4, 2025)]);

    const page = await signInPage(chromium.browser, baseUrl, owner, {
      viewport: { width: 1366, height: 900 },
    });
    await mainNav(page).getByRole("link", { name: "Audit trail" }).click();
    await page
      .getByRole("heading", { level: 1, name: "Audit trail" })
      .waitFor();
    await expect.poll(() => page.title()).toBe("Audit trail · Joulebook");
    await page.getByText("Closed month adjusted").waitFor();
    const everything = await gridRows(page);
    expect(everything).toHaveLength(2);
    expect(everything[0]).toContain("Closed month adjusted");
    expect(everything[0]).toContain("10 kWh");
    expect(everything[0]).toContain("25 kWh");
    expect(everything[1]).toContain("Month closed");

    // Only the month closes, and the URL says so.
    await page
      .getByLabel("Kind of change")
      .selectOption({ label: "Month close and reopen" });
    await page.waitForURL(/kind=month/);
    await expect.poll(() => gridRows(page)).toHaveLength(1);
    expect((await gridRows(page))[0]).toContain("Month closed");
    expect(await page.getByRole("status").first().textContent()).toContain(
      "1 entry",
    );

    // The export carries the same entries as the page shows.
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByRole("link", { name: "Export CSV" }).click(),
    ]);
    const csv = Papa.parse<string[]>(
      readFileSync((await download.path())!, "utf8").trim(),
    ).data;
    expect(csv).toHaveLength(2);
    expect(csv[1][2]).toBe("Month closed");
    expect(csv[1][9]).toBe("State: Closed");

    // From the Ledger: the adjusted row opens its adjusting entries.
    await page.goto(
      `${baseUrl}/o/${org.org.id}/ledger?from=2026-09&to=2026-09`,
    );
    await page.getByRole("link", { name: /\(1\)/ }).first().click();
    await page.waitForURL(/\/audit\?kind=adjustment/);
    await page.getByText("From the Ledger").waitFor();
    await expect.poll(() => gridRows(page)).toHaveLength(1);
    expect((await gridRows(page))[0]).toContain("Closed month adjusted");
    expect(await page.getByLabel("Kind of change").inputValue()).toBe(
      "adjustment",
    );
    await page.getByRole("button", { name: "Show all entries" }).click();
    await page.waitForURL((url) => !url.search.includes("since="));
    await page.close();
  });

  it("an energy manager has no Audit trail in the navigation and is refused the page", async () => {
    const org = await createMeteredOrg({ roles: ["energy_manager"] });
    const page = await signInPage(
      chromium.browser,
      baseUrl,
      org.org.members[0],
    );
    await mainNav(page).getByRole("link", { name: "Ledger" }).waitFor();
    expect(
      await mainNav(page).getByRole("link", { name: "Audit trail" }).count(),
    ).toBe(0);
    const response = await page.goto(`${baseUrl}/o/${org.org.id}/audit`);
    expect(response?.status()).toBe(403);
    await page
      .getByRole("heading", { name: "Not allowed for your role" })
      .waitFor();
    await page.close();
  });
});
