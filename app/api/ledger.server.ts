import type { NextFunction, Request, Response } from "express";
import { MONTH_PATTERN, monthCount } from "~/lib/months";
import ExcelJS from "exceljs";
import { z } from "zod";
import { ledgerRows, type Ledger } from "~/ledger/ledger-rows.server";
import { sendError, sendValidationError } from "./respond.server";

const monthField = (name: string) =>
  z.string().regex(MONTH_PATTERN, `${name}: expected a month as YYYY-MM`);

const querySchema = z.strictObject({
  from: monthField("from"),
  to: monthField("to"),
  site: z.union([z.literal(""), z.uuid("site: expected a site id")]).optional(),
  carrier: z
    .enum(["", "heat", "cooling", "steam", "electricity"], {
      error: "carrier: heat, cooling, steam or electricity",
    })
    .optional(),
});

/** Ten years of months at most per request. */
const MAX_MONTHS = 120;

async function loadLedger(req: Request, res: Response): Promise<Ledger | null> {
  const parsed = querySchema.safeParse(req.query);
  if (!parsed.success) {
    sendValidationError(res, parsed.error);
    return null;
  }
  const { from, to, site, carrier } = parsed.data;
  const span = monthCount(from, to);
  if (span < 1 || span > MAX_MONTHS) {
    sendError(
      res,
      400,
      "invalid_range",
      `from must not be after to, and the range at most ${MAX_MONTHS} months.`,
    );
    return null;
  }
  return ledgerRows({
    organizationId: res.locals.member!.organizationId,
    from,
    to,
    siteId: site || null,
    carrier: carrier || null,
  });
}

/** GET /api/v1/orgs/:orgId/ledger: the grid, the exports and outside tools read this. */
export async function getLedger(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const ledger = await loadLedger(req, res);
    if (ledger) res.json(ledger);
  } catch (error) {
    next(error);
  }
}

const COLUMNS = [
  ["site", "site_name"],
  ["month", "month"],
  ["carrier", "carrier"],
  ["imports_kwh", "imports_kwh"],
  ["exports_kwh", "exports_kwh"],
  ["net_kwh", "net_kwh"],
  ["estimated_kwh", "estimated_kwh"],
  ["estimated_share", "estimated_share"],
  ["status", "status"],
  ["adjustments_kwh", "adjustments_kwh"],
  ["adjustment_count", "adjustment_count"],
] as const;

function csvCell(value: unknown): string {
  const text = value === null || value === undefined ? "" : String(value);
  return /[",\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

function filename(ledger: Ledger, ext: string): string {
  return `joulebook-ledger-${ledger.from}-to-${ledger.to}.${ext}`;
}

/** GET …/ledger.csv: exact decimal kWh, signed (into the site positive). */
export async function getLedgerCsv(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const ledger = await loadLedger(req, res);
    if (!ledger) return;
    const lines = [COLUMNS.map(([h]) => h).join(",")];
    for (const row of ledger.rows)
      lines.push(COLUMNS.map(([, k]) => csvCell(row[k])).join(","));
    res
      .type("text/csv; charset=utf-8")
      .attachment(filename(ledger, "csv"))
      .send(`${lines.join("\n")}\n`);
  } catch (error) {
    next(error);
  }
}

/** GET …/ledger.xlsx: the same rows as numbers, with a totals line. */
export async function getLedgerXlsx(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const ledger = await loadLedger(req, res);
    if (!ledger) return;
    const book = new ExcelJS.Workbook();
    book.creator = "Joulebook";
    const sheet = book.addWorksheet("Ledger");
    sheet.columns = COLUMNS.map(([header, key]) => ({
      header,
      key,
      width: header === "site" ? 32 : 16,
    }));
    const numeric = new Set([
      "imports_kwh",
      "exports_kwh",
      "net_kwh",
      "estimated_kwh",
      "adjustments_kwh",
    ]);
    for (const row of ledger.rows) {
      sheet.addRow(
        Object.fromEntries(
          COLUMNS.map(([, k]) => [k, numeric.has(k) ? Number(row[k]) : row[k]]),
        ),
      );
    }
    sheet.addRow({
      site_name: "Total",
      imports_kwh: Number(ledger.totals.imports_kwh),
      exports_kwh: Number(ledger.totals.exports_kwh),
      net_kwh: Number(ledger.totals.net_kwh),
    }).font = { bold: true };
    sheet.getRow(1).font = { bold: true };
    const buffer = await book.xlsx.writeBuffer();
    res
      .type("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet")
      .attachment(filename(ledger, "xlsx"))
      .send(Buffer.from(buffer));
  } catch (error) {
    next(error);
  }
}
