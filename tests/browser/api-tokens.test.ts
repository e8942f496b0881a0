import { eq } from "drizzle-orm";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, mainNav, signInPage } from "../support/browser";
import { db, schema } from "../support/db";
import { createMeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

describe("organisation API tokens", () => {
  it("an owner creates a token, sees the secret once, copies it, and revokes it after confirming", async () => {
    const org = await createMeteredOrg({ roles: ["owner"] });
    const page = await signInPage(
      chromium.browser,
      baseUrl,
      org.org.members[0],
    );
    await page
      .context()
      .grantPermissions(["clipboard-read", "clipboard-write"], {
        origin: baseUrl,
      });
    await page.goto(`${baseUrl}/o/${org.org.id}`);
    await mainNav(page).getByRole("link", { name: "API tokens" }).click();
    await page
      .getByRole("heading", { name: "API tokens", exact: true })
      .waitFor();

    await page.getByLabel("Token name").fill("Monthly report script");
    await page.getByLabel("Acts as").selectOption("energy_manager");
    expect(await page.getByLabel("Expires after").inputValue()).toBe("90");
    await page.getByRole("button", { name: "Create and show token" }).click();
    const secretBox = page.getByTestId("new-api-token");
    await secretBox.waitFor();
    const secret = (await secretBox.textContent()) ?? "";
    expect(secret).toMatch(/^jbtk_[A-Za-z0-9_-]{43}$/);
    await page.getByRole("button", { name: "Copy token" }).click();
    await page.getByRole("button", { name: "Copied" }).waitFor();
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(
      secret,
    );

    // The secret works, and is gone from the page after a reload.
    const answer = await fetch(`${baseUrl}/api/v1/orgs/${org.org.id}/sites`, {
      headers: { authorization: `Bearer ${secret}` },
    });
    expect(answer.status).toBe(200);
    await page.reload();
    await page.getByText("Monthly report script").first().waitFor();
    expect(await page.getByTestId("new-api-token").count()).toBe(0);
    expect(await page.content()).not.toContain(secret);

    const name = "Monthly report script";
    await page.getByRole("link", { name: `Revoke ${name}…` }).click();
    const question = page.getByRole("form", { name: `Revoke ${name}?` });
    await question.waitFor();
    await question.getByRole("link", { name: "Cancel" }).click();
    await question.waitFor({ state: "detached" });
    const [kept] = await db
      .select()
      .from(schema.apiTokens)
      .where(eq(schema.apiTokens.organizationId, org.org.id));
    expect(kept.revokedAt).toBeNull();

    await page.getByRole("link", { name: `Revoke ${name}…` }).click();
    await question.getByRole("button", { name: `Revoke ${name}` }).click();
    await page.getByText("API token revoked").waitFor();
    await page.getByText("Revoked", { exact: true }).waitFor();
    const refused = await fetch(`${baseUrl}/api/v1/orgs/${org.org.id}/sites`, {
      headers: { authorization: `Bearer ${secret}` },
    });
    expect(refused.status).toBe(401);
    await page.close();
  });
});
