/**
 * The Readings page's upload of a supplier's file, as a person does it: a
 * one-row-per-day file with dd/mm/yyyy dates across the October clock change
 * in Europe/London, read in the browser, mapped, previewed and sent; the
 * intervals land in the database, and the same file again changes nothing.
 * A file with a bad value stores nothing until "store the good rows only".
 */
import { and, eq, sql } from "drizzle-orm";
import ExcelJS from "exceljs";
import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { chromiumForFile, signInPage } from "../support/browser";
import { db, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";
import { intervalHeadings } from "../../app/ingest/supplier-files/templates";
import { wideSupplierFile } from "../support/wide-supplier-file";

const baseUrl = inject("baseUrl");
const chromium = chromiumForFile();

/**
 * The meters' resolution, and the file's: half-hourly, the usual supplier
 * data. The file has 48 columns a day and 50 values on 25 October.
 */
const MINUTES = 30;
const PER_DAY = 1440 / MINUTES;
/** 24–26 October 2026: the middle day has 25 hours (50 half-hours) in London (01:00–02:00 BST and GMT). */
const DAYS = { firstDay: "2026-10-24", days: 3 };

/** A meter with no data yet set to record `minutes`-long intervals. */
async function withResolution<M extends { id: string }>(
  meter: M,
  minutes: number,
): Promise<M> {
  await db
    .update(schema.meters)
    .set({ intervalMinutes: minutes })
    .where(eq(schema.meters.id, meter.id));
  return meter;
}

async function openUpload(org: MeteredOrg): Promise<Page> {
  const owner = org.org.members[0];
  const page = await signInPage(chromium.browser, baseUrl, {
    email: owner.email,
    password: owner.password,
  });
  await page.goto(`${baseUrl}/o/${org.org.id}/readings`);
  await page
    .getByRole("heading", { name: "Upload historical readings" })
    .waitFor();
  return page;
}

async function chooseFile(page: Page, name: string, csv: string | Buffer) {
  await page.getByLabel("File of readings (CSV or Excel .xlsx)").setInputFiles({
    name,
    mimeType: name.endsWith(".xlsx")
      ? "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
      : "text/csv",
    buffer: typeof csv === "string" ? Buffer.from(csv) : csv,
  });
}

async function storedIntervals(meterId: string) {
  const [row] = await db
    .select({
      count: sql<number>`count(*)::int`,
      centiKwh: sql<string>`coalesce(sum(${schema.intervals.energyKwh}) * 100, 0)::bigint::text`,
    })
    .from(schema.intervals)
    .where(
      and(
        eq(schema.intervals.meterId, meterId),
        eq(schema.intervals.quality, "measured"),
      ),
    );
  return { count: row.count, centiKwh: Number(row.centiKwh) };
}

describe("uploading a supplier's one-row-per-day file", () => {
  it("stores each interval across the October clock change, and a repeat changes nothing", async () => {
    const org = await createMeteredOrg();
    const meter = await withResolution(org.meters.water, MINUTES);
    const file = wideSupplierFile({
      meterCodes: [meter.code],
      minutes: MINUTES,
      ...DAYS,
    });
    // 48 + 50 + 48 half-hours: the file's middle row runs two values past its header.
    expect(file.values).toBe(3 * PER_DAY + 60 / MINUTES);
    const page = await openUpload(org);

    await chooseFile(page, "supplier.csv", file.csv);
    await expect
      .poll(() => page.getByTestId("readings-count").textContent())
      .toMatch(new RegExp(`^${file.values} readings`));
    expect(await page.getByLabel("Layout").inputValue()).toBe("wide");
    await page
      .getByText(/25\/10\/2026: the clocks go back an hour in Europe\/London/)
      .waitFor();
    expect(
      await page.getByRole("table", { name: "Problems in the file" }).count(),
    ).toBe(0);

    await page
      .getByRole("button", { name: `Upload ${file.values} readings` })
      .click();
    await page
      .getByText(`Finished: ${file.values} of ${file.values} readings sent`)
      .waitFor();
    expect(await page.getByTestId("upload-counts").textContent()).toBe(
      `${file.values} accepted · 0 already stored · 0 refused`,
    );
    expect(await storedIntervals(meter.id)).toEqual({
      count: file.values,
      centiKwh: file.totalCentiKwh,
    });

    await page.getByRole("button", { name: "Upload another file" }).click();
    await chooseFile(page, "supplier.csv", file.csv);
    await page
      .getByRole("button", { name: `Upload ${file.values} readings` })
      .click();
    await page
      .getByText(`Finished: ${file.values} of ${file.values} readings sent`)
      .waitFor();
    expect(await page.getByTestId("upload-counts").textContent()).toBe(
      `0 accepted · ${file.values} already stored · 0 refused`,
    );
    await page
      .getByText(
        "Every reading in the file was already stored: nothing changed.",
      )
      .waitFor();
    expect(await storedIntervals(meter.id)).toEqual({
      count: file.values,
      centiKwh: file.totalCentiKwh,
    });
    await page.close();
  });

  it("lists a bad value by row, column and reason and stores nothing until the good rows only are chosen", async () => {
    const org = await createMeteredOrg();
    const meter = await withResolution(org.meters.water, MINUTES);
    const file = wideSupplierFile({
      meterCodes: [meter.code],
      minutes: MINUTES,
      firstDay: "2026-11-02",
      days: 3,
    });
    // Row 3 (the second day) gets a value that is not a number at 05:00.
    const lines = file.csv.split("\n");
    const cells = lines[2].split(",");
    cells[2 + (5 * 60) / MINUTES] = "n/a";
    lines[2] = cells.join(",");
    const page = await openUpload(org);

    await chooseFile(page, "with-a-bad-value.csv", lines.join("\n"));
    const problems = page.getByRole("table", { name: "Problems in the file" });
    await problems.waitFor();
    const rows = problems.locator("tbody tr");
    expect(await rows.count()).toBe(1);
    expect(await rows.first().locator("td").allTextContents()).toEqual([
      "3",
      "05:00",
      '"n/a" is not a number of kWh',
    ]);
    expect(
      await page.getByRole("button", { name: /^Upload \d+ readings$/ }).count(),
    ).toBe(0);
    expect(await storedIntervals(meter.id)).toEqual({ count: 0, centiKwh: 0 });

    const goodReadings = 2 * PER_DAY;
    await page
      .getByRole("button", {
        name: `Store the good rows only (${goodReadings} readings)`,
      })
      .click();
    await page
      .getByText(`Finished: ${goodReadings} of ${goodReadings} readings sent`)
      .waitFor();
    expect((await storedIntervals(meter.id)).count).toBe(goodReadings);
    await page.close();
  });

  it("reads an Excel workbook in the browser: date cells, number cells, one meter chosen for the file", async () => {
    const org = await createMeteredOrg();
    const meter = await withResolution(org.meters.water, MINUTES);
    const workbook = new ExcelJS.Workbook();
    const sheet = workbook.addWorksheet("Usage");
    sheet.addRow(["Date", ...intervalHeadings(MINUTES)]);
    const days = [Date.UTC(2026, 10, 9), Date.UTC(2026, 10, 10)];
    for (const day of days)
      sheet.addRow([
        new Date(day),
        ...Array.from({ length: PER_DAY }, (_, k) => 1 + k / 4),
      ]);
    const buffer = Buffer.from(await workbook.xlsx.writeBuffer());
    const page = await openUpload(org);

    await chooseFile(page, "usage.xlsx", buffer);
    await page.getByLabel("Meter").selectOption(`meter:${meter.code}`);
    const readings = days.length * PER_DAY;
    await expect
      .poll(() => page.getByTestId("readings-count").textContent())
      .toMatch(new RegExp(`^${readings} readings`));
    await page
      .getByRole("button", { name: `Upload ${readings} readings` })
      .click();
    await page
      .getByText(`Finished: ${readings} of ${readings} readings sent`)
      .waitFor();
    const perDayCenti = Array.from(
      { length: PER_DAY },
      (_, k) => 100 + 25 * k,
    ).reduce((a, b) => a + b);
    expect(await storedIntervals(meter.id)).toEqual({
      count: readings,
      centiKwh: days.length * perDayCenti,
    });
    await page.close();
  });
});
