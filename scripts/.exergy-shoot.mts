import { launchBrowser } from "../tests/support/browser";
const base = process.argv[2];
const browser = await launchBrowser();
for (const [label, viewport] of [
  ["desktop", { width: 1366, height: 900 }],
  ["phone", { width: 390, height: 844 }],
] as const) {
  const page = await browser.newPage({ viewport });
  await page.goto(`${base}/sign-in`);
  await page.getByLabel("E-mail address").fill("owner@larchmere.example");
  await page.getByLabel("Password").fill("larchmere-demo-2026");
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/o\//);
  const orgPath = new URL(page.url()).pathname.replace(/\/$/, "").split("/").slice(0, 3).join("/");
  await page.goto(`${base}${orgPath}/sites`, { waitUntil: "networkidle" });
  const links = await page.locator('a[href*="/sites/"]').evaluateAll((as) =>
    as.map((a) => [(a as HTMLAnchorElement).textContent?.trim(), (a as HTMLAnchorElement).getAttribute("href")]),
  );
  for (const [name, href] of links) {
    if (!href || href.endsWith("/plant") || href.endsWith("/new")) continue;
    if (!/Depot|Sheltered|Leisure|Civic/i.test(name ?? "")) continue;
    await page.goto(`${base}${href}?month=${process.argv[3] ?? "2026-01"}`, { waitUntil: "networkidle" });
    await page.waitForTimeout(800);
    const slug = (name ?? "site").replace(/\W+/g, "-").toLowerCase().slice(0, 20);
    const balance = page.locator("#balance-heading").locator("..");
    await balance.screenshot({ path: `/tmp/exergy-shots/${label}-${slug}.png` });
  }
  await page.goto(`${base}${orgPath}/ledger`);
  await page.locator('[row-id^="total"]').first().waitFor();
  await page.screenshot({ path: `/tmp/exergy-shots/${label}-ledger.png` });
}
await browser.close();
