import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, signInPage } from "../support/browser";
import { createOrganization, roleOf } from "../support/db";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

describe("changing roles on the Members page", () => {
  it("after a refused last-owner demotion the menu shows the stored role; a later change still saves", async () => {
    const org = await createOrganization(["owner", "energy_manager"]);
    // createOrganization names each member "<role> <i> <tag>", as in the address.
    const [owner, manager] = org.members.map((m) => ({
      ...m,
      name: m.email.split("@")[0].replaceAll("-", " "),
    }));
    const page = await signInPage(chromium.browser, baseUrl, owner);
    await page.goto(`${baseUrl}/o/${org.id}/members`);
    const ownRole = page.getByLabel(`Role of ${owner.name}`);
    const ownRow = page.getByRole("listitem").filter({ has: ownRole });

    for (const refused of ["auditor", "finance"]) {
      await ownRole.selectOption(refused);
      await ownRow.getByRole("button", { name: "Save" }).click();
      await page.getByText("at least one owner").waitFor();
      await expect.poll(() => ownRole.inputValue()).toBe("owner");
      expect(await roleOf(org.id, owner.id)).toBe("owner");
    }

    // The menus still work afterwards: promote the manager, then step down
    // (a finance member no longer manages members, so the menus go).
    const managerRole = page.getByLabel(`Role of ${manager.name}`);
    await managerRole.selectOption("owner");
    await page
      .getByRole("listitem")
      .filter({ has: managerRole })
      .getByRole("button", { name: "Save" })
      .click();
    await page.getByText("Role changed to Owner").waitFor();
    await ownRole.selectOption("finance");
    await ownRow.getByRole("button", { name: "Save" }).click();
    await page.getByText("Role changed to Finance").waitFor();
    await expect.poll(() => roleOf(org.id, owner.id)).toBe("finance");
    await page.close();
  });
});
