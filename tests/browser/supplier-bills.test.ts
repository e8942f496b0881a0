/**
 * The Supplier bills page, as a manager uses it: an Excel file of two bills
 * for supplies made here is uploaded, one is agreed and one queried against
 * the meters and the tariff; the same bills again as CSV store nothing new;
 * the queried bill is resolved with a note and its history shows it.
 */
import ExcelJS from "exceljs";
import Papa from "papaparse";
import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import {
  agreedAndQueriedCsv,
  createBillSupplies,
} from "../support/bill-supplies";
import { chromiumForFile, signInPage } from "../support/browser";
import { Client } from "../support/http";
import { createMeteredOrg } from "../support/metered-org";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

async function xlsxOf(csv: string): Promise<Buffer> {
  const workbook = new ExcelJS.Workbook();
  const sheet = workbook.addWorksheet("Bills");
  for (const row of Papa.parse<string[]>(csv).data) sheet.addRow(row);
  return Buffer.from(await workbook.xlsx.writeBuffer());
}

async function upload(page: Page, name: string, bytes: Buffer) {
  await page.getByLabel("Bill file (CSV or Excel .xlsx)").setInputFiles({
    name,
    mimeType: name.endsWith(".xlsx")
      ? "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
      : "text/csv",
    buffer: bytes,
  });
  await page.getByRole("button", { name: "Check and store the bills" }).click();
}

const states = (page: Page) => page.getByTestId("bill-state").allTextContents();

describe("checking a supplier's bills", () => {
  it("agrees one bill and queries the other, and a repeat stores nothing", async () => {
    const org = await createMeteredOrg();
    const owner = org.org.members[0];
    const manager = new Client();
    await manager.signIn(owner.email, owner.password);
    const supplies = await createBillSupplies(org, manager);
    const csv = agreedAndQueriedCsv(supplies);

    const page = await signInPage(chromium.browser, baseUrl, {
      email: owner.email,
      password: owner.password,
    });
    await page.goto(`${baseUrl}/o/${org.org.id}/supplier-bills`);
    await page.getByRole("heading", { name: "Supplier bills" }).waitFor();

    // A file with an unknown supply: refused with the row and reason, nothing stored.
    await upload(
      page,
      "bills.csv",
      Buffer.from(`${csv}\nNO-SUCH-METER,2026-01-01,2026-01-31,1,1,actual`),
    );
    const problems = page.getByRole("table", {
      name: "Problems in the bill file",
    });
    await problems.getByText('Unknown supply "NO-SUCH-METER"').waitFor();
    expect(
      await problems.getByRole("cell", { name: "4", exact: true }).count(),
    ).toBe(1);
    expect(await page.getByTestId("bill-row").count()).toBe(0);

    await upload(page, "bills.xlsx", await xlsxOf(csv));
    await page
      .getByText("Checked: 2 stored (1 agreed, 1 queried), 0 already stored.")
      .waitFor();
    expect((await states(page)).sort()).toEqual(["Agreed", "Queried"]);
    const queriedRow = page
      .getByTestId("bill-row")
      .filter({ hasText: supplies[1].tariffName });
    expect(await queriedRow.getByTestId("bill-state").textContent()).toBe(
      "Queried",
    );
    await page
      .getByRole("link", { name: "Download the 1 queried bill (CSV)" })
      .waitFor();

    await upload(page, "bills.csv", Buffer.from(csv));
    await page
      .getByText("Checked: 0 stored (0 agreed, 0 queried), 2 already stored.")
      .waitFor();
    expect(await page.getByTestId("bill-row").count()).toBe(2);

    await queriedRow.getByLabel(/^State of the bill/).selectOption("resolved");
    await queriedRow
      .getByLabel(/^Note for the bill/)
      .fill("Credit note received");
    await queriedRow.getByRole("button", { name: "Save" }).click();
    await page.getByText(/is resolved\.$/).waitFor();
    await expect
      .poll(async () => (await states(page)).sort())
      .toEqual(["Agreed", "Resolved"]);
    await queriedRow.getByText("History (2)").click();
    await queriedRow
      .getByText(/queried → resolved by .*Credit note received/)
      .waitFor();
    await page.close();
  });
});
