import { eq } from "drizzle-orm";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, mainNav, signInPage } from "../support/browser";
import { db, schema } from "../support/db";
import { createMeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const stripeUrl = inject("stripeUrl");
const chromium = chromiumForFile();

describe("paying for Joulebook", () => {
  it("a finance member subscribes through Checkout and sees the active plan", async () => {
    const org = await createMeteredOrg({ roles: ["owner", "finance"] });
    const finance = org.org.members.find((m) => m.role === "finance")!;
    const page = await signInPage(chromium.browser, baseUrl, finance);

    await mainNav(page).getByRole("link", { name: "Billing" }).click();
    await page.getByRole("heading", { level: 1, name: "Billing" }).waitFor();
    expect(await page.getByText("Free trial").count()).toBeGreaterThan(0);
    expect(await page.getByTestId("metered-count").textContent()).toBe("1");

    await page.getByRole("button", { name: "Subscribe with Checkout" }).click();
    await page.waitForURL((url) =>
      url.href.startsWith(`${stripeUrl}/checkout/`),
    );
    await page.getByRole("button", { name: "Pay £29.00" }).click();
    await page.waitForURL(/\/billing\?checkout=done$/);

    // Stripe's events reach the app on their own; wait for them, then look.
    await fetch(`${stripeUrl}/_fake/flush`, { method: "POST" });
    await page.reload();
    await page
      .getByRole("button", { name: "Manage payment and invoices" })
      .waitFor();
    const plan = page.getByRole("region", { name: "Plan" });
    expect(await plan.getByText("Active", { exact: true }).count()).toBe(1);
    expect(await page.getByText("the paid plan has started").count()).toBe(1);
    const invoices = page.getByRole("region", { name: "Invoices" });
    const invoiceRows = invoices.locator("tbody");
    expect(await invoiceRows.getByText("Paid", { exact: true }).count()).toBe(
      1,
    );

    const [account] = await db
      .select()
      .from(schema.billingAccounts)
      .where(eq(schema.billingAccounts.organizationId, org.org.id));
    expect(account.status).toBe("active");
    await page.close();
  });
});
