/**
 * Takes screenshots of the main pages of a running server, to look at them
 * as a new user would: `node --import tsx scripts/screenshots.ts [baseUrl]`.
 */
import { mkdirSync } from "node:fs";
import {
  drawChartsBelowTheFold,
  launchBrowser,
} from "../tests/support/browser";

const base = process.argv[2] ?? "http://127.0.0.1:3000";
const out = "screenshots";
mkdirSync(out, { recursive: true });

const browser = await launchBrowser();
for (const [label, viewport] of [
  ["desktop", { width: 1366, height: 900 }],
  ["phone", { width: 390, height: 844 }],
] as const) {
  const page = await browser.newPage({ viewport });
  await page.goto(`${base}/sign-in`);
  await page.screenshot({
    path: `${out}/${label}-sign-in.png`,
    fullPage: true,
  });
  await page.getByLabel("E-mail address").fill("owner@larchmere.example");
  await page.getByLabel("Password").fill("larchmere-demo-2026");
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/o\//);
  await page.screenshot({
    path: `${out}/${label}-organisation.png`,
    fullPage: true,
  });
  const orgPath = new URL(page.url()).pathname;
  // The Overview's chart and the Ledger's grid draw in the browser: wait for them.
  await page.goto(`${base}${orgPath}/overview`);
  await page.locator(".recharts-bar-rectangle").first().waitFor();
  // Charts below the fold are drawn as they are scrolled to.
  await drawChartsBelowTheFold(page);
  await page.screenshot({
    path: `${out}/${label}-overview.png`,
    fullPage: true,
  });
  await page.goto(`${base}${orgPath}/ledger`);
  await page.locator('[row-id^="total"]').first().waitFor();
  await page.screenshot({ path: `${out}/${label}-ledger.png`, fullPage: true });
  for (const path of [
    "sites",
    "readings",
    "weather",
    "reports",
    "billing",
    "gateways",
    "members",
    "audit",
    "api-tokens",
    "tariffs",
    "carbon",
    "../../outbox",
    "../../account",
  ]) {
    // Pages that fetch their rows after loading (the audit trail) are
    // pictured once the network is quiet.
    await page.goto(new URL(path, `${base}${orgPath}/`).href, {
      waitUntil: "networkidle",
    });
    await drawChartsBelowTheFold(page);
    await page.screenshot({
      path: `${out}/${label}-${path.replaceAll("../", "")}.png`,
      fullPage: true,
    });
  }
  // A site with plant: its page (the boundary and balance) and its Plant page.
  await page.goto(`${base}${orgPath}/sites`);
  await page.getByRole("link", { name: "Depot & Laundry" }).first().click();
  await page.waitForURL(/\/sites\/[0-9a-f-]+$/);
  await page.screenshot({ path: `${out}/${label}-site.png`, fullPage: true });
  await page.getByRole("link", { name: "Plant and its checks" }).click();
  await page.locator(".recharts-line").first().waitFor();
  await page.screenshot({ path: `${out}/${label}-plant.png`, fullPage: true });
  await page.goto(`${base}/o/00000000-0000-0000-0000-000000000000`);
  await page.screenshot({ path: `${out}/${label}-404.png`, fullPage: true });
  await page.close();
}
await browser.close();
console.log(`screenshots in ${out}/`);
