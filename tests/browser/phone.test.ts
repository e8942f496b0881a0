/**
 * A phone (390 × 844): the site page fits the screen, and the grids show
 * figures, not only their first columns.
 */
import type { Browser, Locator, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import {
  drawChartsBelowTheFold,
  launchBrowser,
  signInPage,
} from "../support/browser";
import { db, pool, schema } from "../support/db";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const PHONE = { width: 390, height: 844 };
let browser: Browser;
let org: MeteredOrg;
let page: Page;

/** Hourly register reads: `hours` steps of `step` kWh from `start`. */
function registerSeries(
  code: string,
  start: number,
  hours: number,
  step: number,
) {
  return Array.from({ length: hours + 1 }, (_, i) => ({
    meter: code,
    quantity: "electric_register",
    time: new Date(start + i * 3_600_000).toISOString(),
    register_kwh: Math.round((1000 + i * step) * 1000) / 1000,
  }));
}

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  browser = await launchBrowser();
  org = await createMeteredOrg({ roles: ["energy_manager"] });
  // Forty days of hourly reads up to the last full hour: figures for the
  // last 30 days, two ledger months and a page of intervals.
  const hours = 40 * 24;
  const start = (Math.floor(Date.now() / 3_600_000) - hours - 1) * 3_600_000;
  const posted = await new Client().postJson(
    "/api/v1/readings",
    {
      readings: [
        ...registerSeries(org.meters.register.code, start, hours, 12.5),
        ...registerSeries(org.meters.export.code, start, hours, 3.25),
      ],
    },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(posted.status).toBe(200);
  page = await signInPage(browser, baseUrl, org.org.members[0], {
    viewport: PHONE,
  });
});
afterAll(async () => {
  await browser?.close();
  await pool.end();
});

async function open(path: string) {
  await page.goto(`${baseUrl}${path}`, { waitUntil: "networkidle" });
  await drawChartsBelowTheFold(page);
}

/** Whether the element lies wholly inside the screen's width. */
async function onScreen(locator: Locator): Promise<boolean> {
  const box = await locator.boundingBox();
  return box !== null && box.x >= 0 && box.x + box.width <= PHONE.width;
}

describe("on a phone", () => {
  it("the site page has no sideways scroll and shows each meter's figure", async () => {
    await open(`/o/${org.org.id}/sites/${org.siteId}`);
    await page.getByRole("heading", { name: "Meters" }).waitFor();
    const { scrollWidth, innerWidth } = await page.evaluate(() => ({
      scrollWidth: document.documentElement.scrollWidth,
      innerWidth: window.innerWidth,
    }));
    expect(scrollWidth).toBeLessThanOrEqual(innerWidth);
    const register = page.locator(
      `tr[data-meter="${org.meters.register.code}"]`,
    );
    const figure = register.getByText(/Wh$/);
    expect(await figure.textContent()).toMatch(/\d/);
    expect(await onScreen(figure)).toBe(true);
    expect(
      await onScreen(register.getByRole("link", { name: "Readings" })),
    ).toBe(true);
  });

  it("the ledger grid shows its figures beside the entry", async () => {
    await open(`/o/${org.org.id}/ledger`);
    const grid = page.locator(".ag-root-wrapper").first();
    await grid.waitFor();
    const delivered = grid
      .locator(".ag-header-cell")
      .filter({ hasText: "Delivered" });
    await delivered.waitFor();
    expect(await onScreen(delivered)).toBe(true);
    // The figure under it in the first entry's row.
    const column = await delivered.getAttribute("col-id");
    const figure = grid.locator(`.ag-row .ag-cell[col-id="${column}"]`).first();
    expect(await figure.textContent()).toMatch(/\d/);
    expect(await onScreen(figure)).toBe(true);
    expect(
      await page.evaluate(() => document.documentElement.scrollWidth),
    ).toBeLessThanOrEqual(PHONE.width);
  });

  it("the interval grid shows the hour and its energy in full", async () => {
    await open(`/o/${org.org.id}/meters/${org.meters.register.id}/readings`);
    const grid = page.locator(".ag-root-wrapper").first();
    await grid.waitFor();
    const energy = grid
      .locator('.ag-cell[col-id="energy_kwh"]')
      .filter({ hasText: "12.5" })
      .first();
    await energy.waitFor();
    expect(await onScreen(energy)).toBe(true);
    const hour = grid.locator('.ag-cell[col-id="start"]').first();
    // Not truncated: the whole hour fits its cell.
    expect(
      await hour.evaluate((cell) => {
        const text = cell.querySelector(".ag-cell-value") ?? cell;
        return text.scrollWidth <= text.clientWidth;
      }),
    ).toBe(true);
    expect(await onScreen(hour)).toBe(true);
  });
});

describe("a meter's readings summary", () => {
  /** The summary's figure under `label`, e.g. "Delivered". */
  async function summaryFigure(meterId: string, label: string) {
    await open(`/o/${org.org.id}/meters/${meterId}/readings`);
    const term = page.locator("dt", { hasText: new RegExp(`^${label}$`) });
    await term.waitFor();
    return term.locator("xpath=following-sibling::dd").textContent();
  }

  it("names an import meter's energy delivered and an export meter's exported, each positive", async () => {
    expect(await summaryFigure(org.meters.register.id, "Delivered")).toMatch(
      /^\d[\d,.]* kWh$/,
    );
    expect(await summaryFigure(org.meters.export.id, "Exported")).toMatch(
      /^\d[\d,.]* kWh$/,
    );
    expect(await page.locator("dt", { hasText: "Signed" }).count()).toBe(0);
  });
});

describe("no page of an organisation scrolls sideways on a phone", () => {
  const pages = [
    "overview",
    "sites",
    "readings",
    "weather",
    "gateways",
    "reports",
    "members",
    "audit",
  ];
  it.each(pages)("%s", async (path) => {
    await open(`/o/${org.org.id}/${path}`);
    expect(
      await page.evaluate(() => document.documentElement.scrollWidth),
    ).toBeLessThanOrEqual(PHONE.width);
  });
});
