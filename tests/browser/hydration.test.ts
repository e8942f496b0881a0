/**
 * Pages must hydrate without React's mismatch errors (#418: the server's
 * text differs from the browser's first render). The browser here is what
 * many users have: a clock that is not the server's (three hours ahead) and a
 * time zone that is not the server's (UTC), so any relative time computed
 * from the local clock, or any date written in the local zone, shows up.
 */
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchBrowser } from "../support/browser";
import { db, pool, schema } from "../support/db";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
let browser: Browser;
let org: MeteredOrg;

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  browser = await launchBrowser();
  org = await createMeteredOrg({ roles: ["owner"] });
  // A gateway heard from four minutes ago: the gateway list, the
  // organisation's home page and the revoke confirmation say so.
  await db
    .update(schema.gateways)
    .set({ lastSeenAt: new Date(Date.now() - 4 * 60_000) })
    .where(eq(schema.gateways.id, org.gatewayId));
  // An invitation: a message in the Outbox ("… ago") and a pending
  // invitation with its expiry time on the Members page.
  const owner = new Client();
  await owner.signIn(org.org.members[0].email, org.org.members[0].password);
  const invite = await owner.post(`/o/${org.org.id}/members`, {
    intent: "invite",
    email: `hydration-${org.tag}@example.com`,
    role: "auditor",
  });
  expect(invite.status).toBe(200);
});
afterAll(async () => {
  await browser?.close();
  await pool.end();
});

/** A browser three hours ahead of the server, in UTC+14. */
async function skewedOwnerPage(): Promise<Page> {
  const page = await browser.newPage({
    viewport: { width: 1280, height: 900 },
    timezoneId: "Pacific/Kiritimati",
  });
  await page.clock.setFixedTime(new Date(Date.now() + 3 * 3600_000));
  const owner = org.org.members[0];
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel("E-mail address").fill(owner.email);
  await page.getByLabel("Password").fill(owner.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/o\/[0-9a-f-]{36}$/);
  return page;
}

/** Everything the page reported as an error while it loaded and hydrated. */
async function errorsWhileLoading(page: Page, path: string) {
  const errors: string[] = [];
  const onConsole = (m: { type(): string; text(): string }) => {
    if (m.type() === "error") errors.push(m.text());
  };
  const onError = (e: Error) => errors.push(e.message);
  page.on("console", onConsole);
  page.on("pageerror", onError);
  await page.goto(`${baseUrl}${path}`, { waitUntil: "networkidle" });
  // React reports a failed hydration as soon as it has tried; give it a beat.
  await page.waitForTimeout(300);
  page.off("console", onConsole);
  page.off("pageerror", onError);
  return errors;
}

describe("pages with times hydrate cleanly", () => {
  it("the organisation, gateways, members, billing and Outbox pages show no hydration error", async () => {
    const page = await skewedOwnerPage();
    const o = `/o/${org.org.id}`;
    const failures: Record<string, string[]> = {};
    for (const path of [
      o,
      `${o}/gateways`,
      `${o}/gateways?revoke=${org.gatewayId}`,
      `${o}/members`,
      `${o}/billing`,
      "/outbox",
    ]) {
      const errors = await errorsWhileLoading(page, path);
      if (errors.length > 0) failures[path.replace(o, "/o/…")] = errors;
    }
    expect(failures).toEqual({});
    // The relative times are the server's: four minutes, not three hours.
    await page.goto(`${baseUrl}${o}/gateways`);
    expect(
      await page.getByText("Last seen 4 minutes ago").count(),
    ).toBeGreaterThan(0);
    await page.close();
  });
});
