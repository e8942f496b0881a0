/**
 * A manager makes a signed report and watches it finish; an auditor
 * downloads it and checks it on the Verify page, in a real browser.
 */
import { mkdtemp, readFile, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, mainNav, signInPage } from "../support/browser";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

const signIn = (member: { email: string; password: string }) =>
  signInPage(chromium.browser, baseUrl, member);

async function openReports(page: Page) {
  await mainNav(page).getByRole("link", { name: "Reports" }).click();
  await page.getByRole("heading", { level: 1, name: "Reports" }).waitFor();
}

/** A day of hourly register reads in May 2026, so the ledger has a month. */
async function postMayReadings(org: MeteredOrg) {
  const t0 = Date.parse("2026-05-04T00:00:00Z");
  const readings = Array.from({ length: 25 }, (_, i) => ({
    meter: org.meters.register.code,
    quantity: "electric_register",
    time: new Date(t0 + i * 3_600_000).toISOString(),
    register_kwh: 800 + i * 4.25,
  }));
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(response.status).toBe(200);
}

describe("signed reports in the chromium.browser", () => {
  it("a manager makes one, an auditor downloads and verifies it", async () => {
    const org = await createMeteredOrg({
      roles: ["owner", "energy_manager", "auditor"],
    });
    await postMayReadings(org);
    const [, manager, auditor] = org.org.members;

    const m = await signIn(manager);
    await openReports(m);
    await m.getByLabel("Period").selectOption({ label: "May 2026" });
    await m.getByRole("button", { name: "Make signed report" }).click();
    await m.getByText("Report for May 2026 queued").waitFor();
    // The page polls; the finished report gets its download link by itself.
    const item = m.getByTestId("report-item").first();
    await item.getByRole("link", { name: "Download PDF" }).waitFor();
    expect(await item.getByText("Signed · provisional").count()).toBe(1);
    expect(await item.textContent()).toContain(`${org.org.name} · May 2026`);

    const a = await signIn(auditor);
    await openReports(a);
    // Auditors download and verify, but make nothing.
    expect(
      await a.getByRole("button", { name: "Make signed report" }).count(),
    ).toBe(0);
    const [download] = await Promise.all([
      a.waitForEvent("download"),
      a.getByRole("link", { name: "Download PDF" }).first().click(),
    ]);
    const dir = await mkdtemp(join(tmpdir(), "jb-chromium.browser-report-"));
    const file = join(dir, "report.pdf");
    await download.saveAs(file);
    expect((await readFile(file)).subarray(0, 5).toString()).toBe("%PDF-");

    await a.getByRole("link", { name: "Verify a report" }).click();
    await a.getByLabel("Report PDF").setInputFiles(file);
    await a.getByRole("button", { name: "Verify" }).click();
    await a.getByText("Genuine and unaltered").waitFor();
    expect(await a.getByText(`${org.org.name} · May 2026`).count()).toBe(1);

    // The same file with one byte changed in the page content.
    const bytes = await readFile(file);
    const at = bytes.indexOf("stream") + 40;
    bytes[at] ^= 0x01;
    const tampered = join(dir, "tampered.pdf");
    await writeFile(tampered, bytes);
    await a.getByLabel("Report PDF").setInputFiles(tampered);
    await a.getByRole("button", { name: "Verify" }).click();
    await a.getByText("Not a valid Joulebook report").waitFor();
  });
});
