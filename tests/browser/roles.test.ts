import { randomUUID } from "node:crypto";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { inject } from "vitest";
import { chromiumForFile } from "../support/browser";
import { db, schema } from "../support/db";

const baseUrl = inject("baseUrl");
const PASSWORD = "larchmere-demo-2026";
const chromium = chromiumForFile();

async function signInAs(
  email: string,
  viewport = { width: 1280, height: 900 },
): Promise<Page> {
  const page = await chromium.browser.newPage({ viewport });
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(PASSWORD);
  // Keyboard only: Enter submits the form.
  await page.getByLabel("Password").press("Enter");
  await page.waitForURL(/\/o\/[0-9a-f-]{36}$/);
  // The shell's navigation exists only on signed-in pages (hidden in the
  // closed phone menu, hence "attached").
  await page
    .getByRole("navigation", { name: "Main", includeHidden: true })
    .first()
    .waitFor({ state: "attached" });
  return page;
}

const nav = (page: Page) =>
  page.getByRole("navigation", { name: "Main" }).filter({ visible: true });
/** Waits for the text to show, then checks it shows exactly once. */
async function expectVisibleOnce(page: Page, text: string) {
  const locator = visibleText(page, text);
  await locator.first().waitFor();
  expect(await locator.count(), text).toBe(1);
}

const visibleText = (page: Page, text: string) =>
  page.getByText(text, { exact: false }).filter({ visible: true });

describe("what each role sees", () => {
  it("the owner manages members: invite form and role selects", async () => {
    const page = await signInAs("owner@larchmere.example");
    await expect
      .poll(() => page.title())
      .toBe("Larchmere Borough Estates · Joulebook");
    await nav(page).getByRole("link", { name: "Members" }).click();
    await page.waitForURL(/\/members$/);
    await expect.poll(() => page.title()).toBe("Members · Joulebook");
    expect(
      await page.getByRole("heading", { name: "Invite someone" }).count(),
    ).toBe(1);
    expect(await page.getByLabel("Role of Glen Abbott").inputValue()).toBe(
      "auditor",
    );
    expect(
      await page.getByRole("heading", { name: "Pending invitations" }).count(),
    ).toBe(1);
    await page.close();
  });

  for (const [email, label] of [
    ["manager@larchmere.example", "Energy manager"],
    ["finance@larchmere.example", "Finance"],
    ["auditor@larchmere.example", "Auditor"],
  ] as const) {
    it(`${label} sees the members read-only`, async () => {
      const page = await signInAs(email);
      await expectVisibleOnce(page, `You are ${label} here`);
      await nav(page).getByRole("link", { name: "Members" }).click();
      await page.waitForURL(/\/members$/);
      await page.getByRole("heading", { name: "Members", level: 1 }).waitFor();
      await expectVisibleOnce(page, "Ruth Okafor");
      expect(
        await page.getByRole("heading", { name: "Invite someone" }).count(),
      ).toBe(0);
      expect(await page.getByRole("combobox").count()).toBe(0);
      expect(await page.getByRole("button", { name: /Remove/ }).count()).toBe(
        0,
      );
      await page.close();
    });
  }

  it("gateways are listed for managers, not for finance", async () => {
    const manager = await signInAs("manager@larchmere.example");
    await expectVisibleOnce(manager, "Larchmere demo gateway");
    await manager.close();
    const finance = await signInAs("finance@larchmere.example");
    await expectVisibleOnce(finance, "Gateways are managed by owners");
    expect(await visibleText(finance, "Larchmere demo gateway").count()).toBe(
      0,
    );
    await finance.close();
  });

  it("the other organisation's owner never sees Larchmere", async () => {
    const page = await signInAs("owner@hollowmead.example");
    expect(await page.getByText("Larchmere Borough Estates").count()).toBe(0);
    const larchmereUrl = `${baseUrl}/o/${(await db.select().from(schema.organizations)).find((o) => o.name.startsWith("Larchmere"))!.id}`;
    const response = await page.goto(larchmereUrl);
    expect(response?.status()).toBe(404);
    expect(
      await page.getByRole("heading", { name: "Nothing here" }).count(),
    ).toBe(1);
    await page.close();
  });

  it("a member of two organisations switches between them", async () => {
    const page = await signInAs("consultant@fernbank.example");
    await page
      .getByText("Organisation · switch")
      .filter({ visible: true })
      .click();
    await page
      .getByRole("link", { name: /Hollowmead Housing Co-operative/ })
      .click();
    await page
      .getByRole("heading", {
        level: 1,
        name: "Hollowmead Housing Co-operative",
      })
      .waitFor();
    await expectVisibleOnce(page, "You are Energy manager here");
    await page.close();
  });

  it("works on a phone: the menu opens and leads to Members", async () => {
    const page = await signInAs("auditor@larchmere.example", {
      width: 390,
      height: 844,
    });
    await page.getByText("Menu").click();
    await nav(page).getByRole("link", { name: "Members" }).click();
    await page.getByRole("heading", { name: "Members", level: 1 }).waitFor();
    await expectVisibleOnce(page, "Glen Abbott");
    await page.close();
  });
});

describe("an invitation from the owner to a new person, end to end", () => {
  it("invite, read it in the Outbox, follow the link, join", async () => {
    const owner = await signInAs("owner@larchmere.example");
    await nav(owner).getByRole("link", { name: "Members" }).click();
    const email = `chromium.browser-${randomUUID().slice(0, 8)}@test.example`;
    await owner.getByLabel("E-mail address").fill(email);
    await owner.getByLabel("Role", { exact: true }).selectOption("finance");
    await owner.getByRole("button", { name: "Send invitation" }).click();
    await owner.getByText(`Invitation sent to ${email}.`).waitFor();
    expect(await owner.getByText(email).count()).toBeGreaterThan(0);

    await nav(owner)
      .getByRole("link", { name: /Outbox/ })
      .click();
    await owner
      .getByRole("link", { name: /Join Larchmere Borough Estates/ })
      .first()
      .click();
    const link = await owner
      .getByRole("link", { name: /\/invitations\// })
      .first()
      .getAttribute("href");
    expect(link).toBeTruthy();
    await owner.close();

    const invitee = await chromium.browser.newPage();
    await invitee.goto(link!);
    await invitee.getByLabel("Your name").fill("Bea Browser");
    await invitee
      .getByLabel("Choose a password")
      .fill("bea-chromium.browser-pass");
    await invitee
      .getByLabel("Repeat the password")
      .fill("bea-chromium.browser-pass");
    await invitee
      .getByRole("button", { name: "Create the account and join" })
      .click();
    await invitee.waitForURL(/\/o\/[0-9a-f-]{36}$/);
    await invitee
      .getByRole("heading", { level: 1, name: "Larchmere Borough Estates" })
      .waitFor();
    await expectVisibleOnce(invitee, "You are Finance here");
    await invitee.close();
  });

  it("a bad e-mail address is explained beside the field", async () => {
    const owner = await signInAs("owner@larchmere.example");
    await nav(owner).getByRole("link", { name: "Members" }).click();
    await owner.getByLabel("E-mail address").fill("not an address");
    await owner.getByRole("button", { name: "Send invitation" }).click();
    await owner.getByText("Enter a valid e-mail address").waitFor();
    expect(
      await owner.getByLabel("E-mail address").getAttribute("aria-invalid"),
    ).toBe("true");
    await owner.close();
  });
});
