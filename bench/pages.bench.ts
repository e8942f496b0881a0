// Time until each main page has settled in headless Chromium (Debian's,
// through playwright-core), best of 3, beside the lightest page measured in
// the same run. Runs against a server already serving the demo: the
// production build of `npm start` (PORT=… npm start), at JOULEBOOK_URL or
// http://127.0.0.1:3000.
//
// "Settled" is measured in the page's own clock from the start of the
// navigation: the load event has fired, the page's last-drawn element is
// there (the Overview's bars, the Ledger's totals row, a chart, or the main
// heading), and two animation frames have passed so the browser has painted
// it. The two frames are in every page's figure alike.
//
// The site page (with its energy-balance diagram) and its Plant page are of
// the demo's Leisure Pool, the site with the most flows (a fuel-cell CHP).

import { execSync } from "node:child_process";
import { chromium, type Browser, type Page } from "playwright-core";
import { SITE } from "../seeds/scenario/larchmere-estate";
import { printAim, printBenchLine } from "./aims";

const BASE_URL = process.env.JOULEBOOK_URL ?? "http://127.0.0.1:3000";
const DEMO_EMAIL = "owner@larchmere.example";
const DEMO_PASSWORD = "larchmere-demo-2026";
const RUNS = 3;
// Issue #17: every page settles within 300 ms.
const PAGE_AIM_MS = 300;

interface BenchPage {
  /** Key in the BENCH line: `<key>_ms`. */
  key: string;
  label: string;
  /** Path below the organisation, e.g. "overview"; `{site}` is the benched site's id. */
  path: string;
  /** The elements drawn last (each must be there); the main heading when nothing draws late. */
  settledWhen: string | string[];
}

const PAGES: BenchPage[] = [
  {
    key: "overview",
    label: "Overview",
    path: "overview",
    // The energy chart's bars and the budget charts in the first screen
    // (the others are drawn as they are scrolled to).
    settledWhen: [
      ".recharts-bar-rectangle",
      '[data-testid^="budget-"] .recharts-bar-rectangle',
    ],
  },
  {
    key: "weather",
    label: "Weather & baselines",
    path: "weather",
    // The degree-day chart; the scatter below the fold is drawn as it is
    // scrolled to (app/components/when-in-view.tsx).
    settledWhen: ".recharts-bar-rectangle",
  },
  {
    key: "ledger",
    label: "Ledger",
    path: "ledger",
    settledWhen: '[row-id^="total"]',
  },
  { key: "sites", label: "Sites", path: "sites", settledWhen: "main h1" },
  {
    key: "readings",
    label: "Readings",
    path: "readings",
    settledWhen: "main h1",
  },
  { key: "reports", label: "Reports", path: "reports", settledWhen: "main h1" },
  { key: "billing", label: "Billing", path: "billing", settledWhen: "main h1" },
  {
    key: "gateways",
    label: "Gateways",
    path: "gateways",
    settledWhen: "main h1",
  },
  { key: "members", label: "Members", path: "members", settledWhen: "main h1" },
  { key: "audit", label: "Audit trail", path: "audit", settledWhen: "main h1" },
  {
    key: "tariffs",
    label: "Tariffs",
    path: "tariffs",
    settledWhen: ".ag-row",
  },
  { key: "carbon", label: "Carbon", path: "carbon", settledWhen: "main h1" },
  {
    key: "budgets",
    label: "Budgets",
    path: "budgets",
    settledWhen: "main h1",
  },
  {
    key: "supplier_bills",
    label: "Supplier bills",
    path: "supplier-bills",
    settledWhen: "main h1",
  },
  {
    key: "site",
    label: "Site (energy balance)",
    path: "sites/{site}",
    settledWhen: ".recharts-sankey-nodes rect",
  },
  {
    key: "plant",
    label: "Plant",
    path: "sites/{site}/plant",
    settledWhen: ".recharts-line-curve",
  },
];

/** The id of the demo site the site and Plant pages are benched on. */
async function benchedSiteId(page: Page, orgPath: string): Promise<string> {
  await page.goto(`${BASE_URL}${orgPath}/sites`);
  const href = await page
    .locator("main a", { hasText: SITE.pool })
    .first()
    .getAttribute("href");
  const id = href && /\/sites\/([^/?#]+)/.exec(href)?.[1];
  if (!id) throw new Error(`no link to ${SITE.pool} on the Sites page`);
  return id;
}

function launchChromium(): Promise<Browser> {
  const executablePath = execSync(
    "command -v chromium || command -v chromium-browser",
    { shell: "/bin/bash", encoding: "utf8" },
  ).trim();
  return chromium.launch({
    executablePath,
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

async function signIn(page: Page): Promise<string> {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.getByLabel("E-mail address").fill(DEMO_EMAIL);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/o\//);
  const match = /^\/o\/[^/]+/.exec(new URL(page.url()).pathname);
  if (!match)
    throw new Error(`signed in to ${page.url()}, not an organisation`);
  return match[0];
}

/** Milliseconds from the navigation's start until the page has settled. */
async function settleMs(
  page: Page,
  url: string,
  settledWhen: string | string[],
) {
  await page.goto(url, { waitUntil: "load" });
  for (const selector of [settledWhen].flat())
    await page.locator(selector).first().waitFor();
  return page.evaluate(
    () =>
      new Promise<{ settled: number; document: number }>((resolve) =>
        requestAnimationFrame(() =>
          requestAnimationFrame(() => {
            const [nav] = performance.getEntriesByType(
              "navigation",
            ) as PerformanceNavigationTiming[];
            resolve({ settled: performance.now(), document: nav.responseEnd });
          }),
        ),
      ),
  );
}

async function serverAnswers(): Promise<boolean> {
  try {
    const answer = await fetch(`${BASE_URL}/sign-in`);
    return answer.ok;
  } catch {
    return false;
  }
}

export async function benchPages(): Promise<void> {
  if (!(await serverAnswers())) {
    console.log(
      `no server at ${BASE_URL}: start the demo (PORT=3000 npm start) or set JOULEBOOK_URL`,
    );
    return;
  }
  const browser = await launchChromium();
  try {
    const page = await browser.newPage({
      viewport: { width: 1366, height: 900 },
    });
    const orgPath = await signIn(page);
    const siteId = await benchedSiteId(page, orgPath);
    const times = new Map<string, number[]>(PAGES.map((p) => [p.key, []]));
    const documents = new Map<string, number[]>(PAGES.map((p) => [p.key, []]));
    // Run 0 warms the server's and the browser's caches; it is not counted.
    for (let run = 0; run <= RUNS; run++) {
      for (const p of PAGES) {
        const ms = await settleMs(
          page,
          `${BASE_URL}${orgPath}/${p.path.replace("{site}", siteId)}`,
          p.settledWhen,
        );
        if (run === 0) continue;
        times.get(p.key)!.push(ms.settled);
        documents.get(p.key)!.push(ms.document);
      }
    }
    report(times, documents);
  } finally {
    await browser.close();
  }
}

function report(
  times: Map<string, number[]>,
  documents: Map<string, number[]>,
): void {
  const best = PAGES.map((p) => ({
    page: p,
    ms: Math.min(...times.get(p.key)!),
    // The server's share: the HTML document fully received.
    documentMs: Math.min(...documents.get(p.key)!),
  }));
  const lightest = best.reduce((a, b) => (b.ms < a.ms ? b : a));
  console.log(
    `pages: settle time in headless Chromium, best of ${RUNS}, ${BASE_URL}\n`,
  );
  const width = Math.max(...PAGES.map((p) => p.label.length));
  console.log(
    `${"page".padEnd(width)}       ms  vs lightest  document ms  aim ≤ ${PAGE_AIM_MS} ms`,
  );
  for (const { page, ms, documentMs } of best) {
    const ratio = (ms / lightest.ms).toFixed(2);
    const met = ms <= PAGE_AIM_MS ? "met" : "not met";
    console.log(
      `${page.label.padEnd(width)}  ${ms.toFixed(0).padStart(7)}  ${`${ratio}×`.padStart(11)}  ${documentMs.toFixed(0).padStart(11)}  ${met}`,
    );
  }
  console.log(`(lightest: ${lightest.page.label})\n`);
  const slowest = best.reduce((a, b) => (b.ms > a.ms ? b : a));
  printAim(
    "slowest page",
    `${slowest.page.label} ${slowest.ms.toFixed(0)} ms (lightest ${lightest.ms.toFixed(0)} ms)`,
    `every page ≤ ${PAGE_AIM_MS} ms`,
    slowest.ms <= PAGE_AIM_MS,
  );
  printBenchLine(
    "pages",
    best.map(({ page, ms }) => [`${page.key}_ms`, ms] as const),
  );
}
