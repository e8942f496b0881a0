import { execSync } from "node:child_process";
import { chromium, type Browser, type Page } from "playwright-core";
import { afterAll, beforeAll } from "vitest";
import { db, pool, schema } from "./db";

/** Debian's chromium, found on PATH; nothing downloads a browser. */
export function chromiumPath(): string {
  return execSync("command -v chromium || command -v chromium-browser", {
    shell: "/bin/bash",
    encoding: "utf8",
  }).trim();
}

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: chromiumPath(),
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

/**
 * One Chromium for a test file: launched before its tests with a clean slate
 * of sign-in attempts (so one file's throttles do not reach the next), closed
 * after them with the file's database pool. Read `.browser` inside tests.
 */
export function chromiumForFile(): { readonly browser: Browser } {
  const handle: { browser: Browser | null } = { browser: null };
  beforeAll(async () => {
    await db.delete(schema.signInAttempts);
    handle.browser = await launchBrowser();
  });
  afterAll(async () => {
    await handle.browser?.close();
    await pool.end();
  });
  return {
    get browser() {
      if (!handle.browser) throw new Error("the browser is not launched yet");
      return handle.browser;
    },
  };
}

/**
 * A new page signed in through the sign-in form, as a person would, landed
 * on their organisation. `password` defaults to the demo password.
 */
export async function signInPage(
  browser: Browser,
  baseUrl: string,
  member: { email: string; password?: string },
  options: { viewport?: { width: number; height: number } } = {},
): Promise<Page> {
  const page = await browser.newPage({
    viewport: options.viewport ?? { width: 1280, height: 900 },
    acceptDownloads: true,
  });
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel("E-mail address").fill(member.email);
  await page
    .getByLabel("Password")
    .fill(member.password ?? "larchmere-demo-2026");
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/o\/[0-9a-f-]{36}$/);
  return page;
}

/** The shell's main navigation as shown (desktop sidebar or open menu). */
export const mainNav = (page: Page) =>
  page.getByRole("navigation", { name: "Main" }).filter({ visible: true });

/**
 * Scrolls to each chart drawn only once in view (app/components/when-in-view.tsx)
 * and waits until it is drawn, so a test reads the whole page as a reader
 * who scrolled through it would see it.
 */
export async function drawChartsBelowTheFold(page: Page): Promise<void> {
  const waiting = page.locator('[data-when-in-view="waiting"]');
  for (let left = await waiting.count(); left > 0;) {
    await waiting.first().scrollIntoViewIfNeeded();
    await page.waitForFunction(
      (before) =>
        document.querySelectorAll('[data-when-in-view="waiting"]').length <
        before,
      left,
    );
    left = await waiting.count();
  }
}
