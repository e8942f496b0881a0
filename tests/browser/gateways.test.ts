import { eq } from "drizzle-orm";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, signInPage } from "../support/browser";
import { db, schema } from "../support/db";
import { createMeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

describe("revoking a gateway", () => {
  it("one click on Revoke… only asks; Cancel keeps the gateway, the confirmation revokes it", async () => {
    const org = await createMeteredOrg({ roles: ["owner"] });
    await db
      .update(schema.gateways)
      .set({ lastSeenAt: new Date(Date.now() - 2 * 3600_000) })
      .where(eq(schema.gateways.id, org.gatewayId));
    const name = `Test gateway ${org.tag}`;
    const page = await signInPage(
      chromium.browser,
      baseUrl,
      org.org.members[0],
    );
    await page.goto(`${baseUrl}/o/${org.org.id}/gateways`);

    await page.getByRole("link", { name: `Revoke ${name}…` }).click();
    const question = page.getByRole("form", { name: `Revoke ${name}?` });
    await question.waitFor();
    expect(await question.textContent()).toContain(
      "It was last seen 2 hours ago",
    );
    // The question takes the focus, for keyboard and screen-reader users.
    await expect
      .poll(() => page.evaluate(() => document.activeElement?.textContent))
      .toBe(`Revoke ${name}?`);
    await question.getByRole("link", { name: "Cancel" }).click();
    await question.waitFor({ state: "detached" });
    const [kept] = await db
      .select()
      .from(schema.gateways)
      .where(eq(schema.gateways.id, org.gatewayId));
    expect(kept.revokedAt).toBeNull();

    await page.getByRole("link", { name: `Revoke ${name}…` }).click();
    await question.getByRole("button", { name: `Revoke ${name}` }).click();
    await page.getByText("Gateway revoked").waitFor();
    await page.getByText("Revoked", { exact: true }).waitFor();
    const [revoked] = await db
      .select()
      .from(schema.gateways)
      .where(eq(schema.gateways.id, org.gatewayId));
    expect(revoked.revokedAt).not.toBeNull();
    await page.close();
  });
});
