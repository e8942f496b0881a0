/**
 * The main pages speak the trade's words: imports positive and exports
 * negative rather than a sign convention, "actual" rather than "measured",
 * "no data" rather than "silent", degree days as the trade writes them, and
 * "signed" only for a digitally signed report. Physics terms belong to the
 * method notes (elements marked `data-method-note`) and the docs. Each page
 * is read as rendered in the browser, grids and charts included.
 */
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import {
  drawChartsBelowTheFold,
  launchBrowser,
  signInPage,
} from "../support/browser";
import { db, pool, schema } from "../support/db";
import { createYearOfData, type YearOfData } from "../support/year-of-data";

const baseUrl = inject("baseUrl");
let browser: Browser;
let page: Page;
let data: YearOfData;
/** The organisation's pages: /o/<id>. */
let org: string;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  data = await createYearOfData();
  browser = await launchBrowser();
  page = await signInPage(browser, baseUrl, data.org.org.members[0]);
  org = new URL(page.url()).pathname;
});
afterAll(async () => {
  await browser?.close();
  await pool.end();
});

/** Words that are not the trade's, with what to say instead. */
const FORBIDDEN: [RegExp, string][] = [
  [
    /\bsigned\b(?![- ](?:in|out)\b)/i,
    '"signed" is for signed reports: say net, ±, or imports +, exports −',
  ],
  [/\bIUPAC\b/, "a sign convention belongs to the method notes"],
  [/\bthermodynamic\b/i, "physics terms belong to the method notes"],
  [/\bsilent(?:ly)?\b/i, 'say "no data"'],
  [/\bmeasured\b/i, 'say "actual" (or "metered")'],
  [/\bdegree-days?\b/i, 'the trade writes "degree days"'],
  [/K·d(?:ay)?\b/, 'degree days with their base: "HDD (15.5 °C)"'],
];

/**
 * The page's words as a person meets them: text (SVG charts and grid
 * headings included) and the labels of controls, outside method notes.
 */
async function wordsOn(path: string, ready?: string): Promise<string> {
  await page.goto(`${baseUrl}${org}${path}`);
  if (ready) await page.locator(ready).first().waitFor();
  await drawChartsBelowTheFold(page);
  return page.evaluate(() => {
    const body = document.body.cloneNode(true) as HTMLElement;
    body
      .querySelectorAll("[data-method-note], script, style, template, noscript")
      .forEach((e) => e.remove());
    const labels = [...body.querySelectorAll("[aria-label], [title]")].map(
      (e) =>
        `${e.getAttribute("aria-label") ?? ""} ${e.getAttribute("title") ?? ""}`,
    );
    return [body.textContent ?? "", ...labels].join("\n");
  });
}

function offending(text: string): string[] {
  return FORBIDDEN.flatMap(([pattern, advice]) => {
    const match = pattern.exec(text);
    if (!match) return [];
    const at = match.index;
    return [`"${text.slice(Math.max(0, at - 40), at + 40)}": ${advice}`];
  });
}

describe("the words on the main pages", () => {
  it("Overview, Ledger, Readings, Weather & baselines and every site speak the trade's words", async () => {
    const pages: [string, string, string | undefined][] = [
      ["Overview", "/overview", ".recharts-bar-rectangle"],
      ["Ledger", "/ledger", '[row-id^="total"]'],
      ["Readings", "/readings", undefined],
      ["Weather & baselines", "/weather", ".recharts-surface"],
      [
        "Weather & baselines with a model",
        `/weather?${data.weatherQuery}`,
        ".recharts-surface",
      ],
      ["Site", `/sites/${data.org.siteId}`, ".recharts-surface"],
    ];

    const found: Record<string, string[]> = {};
    const texts: Record<string, string> = {};
    for (const [name, path, ready] of pages) {
      texts[name] = await wordsOn(path, ready);
      const problems = offending(texts[name]);
      if (problems.length) found[name] = problems;
    }
    expect(found).toEqual({});
    // The pages had their figures to show, not just empty states.
    expect(texts["Weather & baselines with a model"]).toContain("CV(RMSE)");
    expect(texts["Weather & baselines with a model"]).toContain(
      "Weather-normalised savings",
    );
    expect(texts.Overview).toContain("Against baseline");
    expect(texts.Overview).toContain("Expected");
  });

  it("degree days carry their base temperature, and therms are offered beside MMBtu", async () => {
    const weather = await wordsOn(
      `/weather?${data.weatherQuery}`,
      ".recharts-surface",
    );
    expect(weather).toMatch(/HDD \(\d+\.\d[ \u00a0]°C\)/);
    await page.goto(`${baseUrl}${org}/ledger`);
    const units = await page
      .getByLabel("Unit")
      .locator("option")
      .allTextContents();
    expect(units).toEqual(["kWh", "MWh", "GJ", "therm", "MMBtu"]);
  });

  it("the method notes keep the physics: they are marked, and say so", async () => {
    await page.goto(`${baseUrl}${org}/sites/${data.org.siteId}`);
    await page.locator(".recharts-surface").first().waitFor();
    const notes = await page.locator("[data-method-note]").allTextContents();
    expect(notes.join(" ")).toMatch(/Thermodynamic view/);
  });
});
