/**
 * A carrier has one colour wherever it appears: its badge's swatch is the
 * colour of its series on the Overview chart, and the Readings, Ledger and
 * Weather & baselines pages use the same. Change pills are coloured by
 * direction (up red-ish, down green-ish: less delivered energy is better),
 * with an arrow that says it without the colour.
 */
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchBrowser, signInPage } from "../support/browser";
import { db, pool, schema } from "../support/db";
import { createYearOfData, type YearOfData } from "../support/year-of-data";

const baseUrl = inject("baseUrl");
let browser: Browser;
let page: Page;
let data: YearOfData;
let org: string;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  data = await createYearOfData();
  browser = await launchBrowser();
  page = await signInPage(browser, baseUrl, data.org.org.members[0], {
    viewport: { width: 1366, height: 900 },
  });
  org = new URL(page.url()).pathname;
});
afterAll(async () => {
  await browser?.close();
  await pool.end();
});

/** The swatch colour of each carrier badge on the page, as computed (rgb). */
function badgeColours(): Promise<Record<string, string[]>> {
  return page.evaluate(() => {
    const found: Record<string, string[]> = {};
    for (const badge of document.querySelectorAll("[data-carrier]")) {
      const swatch = badge.querySelector("[data-swatch]");
      const carrier = badge.getAttribute("data-carrier")!;
      found[carrier] = [
        ...(found[carrier] ?? []),
        swatch ? getComputedStyle(swatch).backgroundColor : "no swatch",
      ];
    }
    return found;
  });
}

/** One colour per carrier, failing when a carrier's badges disagree. */
function oneEach(found: Record<string, string[]>): Record<string, string> {
  return Object.fromEntries(
    Object.entries(found).map(([carrier, colours]) => {
      expect(new Set(colours).size, carrier).toBe(1);
      return [carrier, colours[0]];
    }),
  );
}

describe("carrier colours", () => {
  it("the Overview chart's series, every badge and the Weather chart share one colour per carrier", async () => {
    await page.goto(`${baseUrl}${org}/overview`);
    await page.locator(".recharts-legend-item").first().waitFor();
    const legend = await page.evaluate(() =>
      [...document.querySelectorAll(".recharts-legend-item")].map((item) => ({
        name: item.textContent ?? "",
        colour: getComputedStyle(item.querySelector(".recharts-legend-icon")!)
          .fill,
      })),
    );
    const series = Object.fromEntries(
      legend
        .filter((l) => l.name.endsWith(" delivered"))
        .map((l) => [l.name.replace(" delivered", "").toLowerCase(), l.colour]),
    );
    expect(Object.keys(series).sort()).toEqual([
      "cooling",
      "electricity",
      "heat",
    ]);
    // Distinct colours, or the chart could not tell carriers apart.
    expect(new Set(Object.values(series)).size).toBe(3);
    expect(oneEach(await badgeColours())).toEqual(series);

    await page.goto(`${baseUrl}${org}/readings`);
    await page.locator("[data-carrier]").first().waitFor();
    expect(oneEach(await badgeColours())).toEqual(series);

    await page.goto(`${baseUrl}${org}/ledger`);
    await page.locator('[row-id^="total"] [data-carrier]').first().waitFor();
    expect(oneEach(await badgeColours())).toEqual(series);

    await page.goto(`${baseUrl}${org}/weather?${data.weatherQuery}`);
    // Read in one go: the chart redraws once it has measured its box.
    const barColour = () =>
      page.evaluate(() => {
        const bar = document.querySelector(".recharts-bar-rectangle path");
        return bar ? getComputedStyle(bar).fill : "";
      });
    await expect.poll(barColour).toBe(series.heat);
  });

  it("change pills: up red-ish, down green-ish, each with its arrow", async () => {
    await page.goto(`${baseUrl}${org}/overview`);
    const pill = (carrier: string) =>
      page.locator(`tr[data-carrier="${carrier}"] [data-direction]`);
    const read = async (carrier: string) => {
      const element = pill(carrier);
      const [direction, text, background] = await Promise.all([
        element.getAttribute("data-direction"),
        element.textContent(),
        element.evaluate((e) => getComputedStyle(e).backgroundColor),
      ]);
      const [r, g] = background.match(/\d+/g)!.map(Number);
      return { direction, text, redder: r > g };
    };
    // Electricity grows every month: more than a year before.
    expect(await read("electricity")).toMatchObject({
      direction: "up",
      redder: true,
    });
    expect((await read("electricity")).text).toMatch(/^▲.*\+\d+\.\d %$/);
    // Cooling shrinks: less than a year before, which is good.
    expect(await read("cooling")).toMatchObject({
      direction: "down",
      redder: false,
    });
    expect((await read("cooling")).text).toMatch(/^▼.*−\d+\.\d %$/);
  });
});
