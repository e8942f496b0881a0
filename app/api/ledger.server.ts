import type { NextFunction, Request, Response } from "express";
import { monthCount } from "~/lib/months";
import ExcelJS from "exceljs";
import { toCsv } from "~/lib/csv-export";
import { ledgerRows } from "~/ledger/ledger-rows.server";
import { sendError, sendValidationError } from "./respond.server";
import { ledgerQuerySchema, type Ledger, type LedgerRow } from "./schemas";

/** Ten years of months at most per request. */
const MAX_MONTHS = 120;

async function loadLedger(req: Request, res: Response): Promise<Ledger | null> {
  const parsed = ledgerQuerySchema.safeParse(req.query);
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

/**
 * The export columns. `text` cells carry words, some typed by people (site
 * names), and stay text in XLSX; `decimal` cells are exact PostgreSQL numerics
 * sent as text, written as numbers; `number` cells are numbers already.
 */
const COLUMNS = [
  { header: "site", key: "site_name", kind: "text" },
  { header: "month", key: "month", kind: "text" },
  { header: "carrier", key: "carrier", kind: "text" },
  { header: "imports_kwh", key: "imports_kwh", kind: "decimal" },
  { header: "exports_kwh", key: "exports_kwh", kind: "decimal" },
  { header: "net_kwh", key: "net_kwh", kind: "decimal" },
  { header: "estimated_kwh", key: "estimated_kwh", kind: "decimal" },
  { header: "estimated_share", key: "estimated_share", kind: "number" },
  { header: "status", key: "status", kind: "text" },
  { header: "adjustments_kwh", key: "adjustments_kwh", kind: "decimal" },
  { header: "adjustment_count", key: "adjustment_count", kind: "number" },
] as const satisfies readonly {
  header: string;
  key: keyof LedgerRow;
  kind: "text" | "decimal" | "number";
}[];

type Column = (typeof COLUMNS)[number];

function filename(ledger: Ledger, ext: string): string {
  return `joulebook-ledger-${ledger.from}-to-${ledger.to}.${ext}`;
}

/** GET …/ledger.csv: exact decimal kWh, delivered ≥ 0 and exported ≤ 0 per carrier. */
export async function getLedgerCsv(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const ledger = await loadLedger(req, res);
    if (!ledger) return;
    const csv = toCsv(
      COLUMNS.map((c) => c.header),
      ledger.rows.map((row) => COLUMNS.map((c) => row[c.key])),
    );
    res
      .type("text/csv; charset=utf-8")
      .attachment(filename(ledger, "csv"))
      .send(csv);
  } catch (error) {
    next(error);
  }
}

/**
 * A plain JS string becomes a string cell, never a formula: exceljs writes a
 * formula only for `{ formula }` objects, which no column produces.
 */
function xlsxValue(column: Column, row: LedgerRow): string | number {
  const value = row[column.key];
  return column.kind === "text" ? String(value) : Number(value);
}

/** GET …/ledger.xlsx: the same rows as numbers, with a totals line per carrier. */
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
    sheet.columns = COLUMNS.map((c) => ({
      header: c.header,
      key: c.key,
      width: c.key === "site_name" ? 32 : 16,
      // Text format, so a spreadsheet keeps a name such as "=HYPERLINK(…)"
      // as text even when someone edits the cell.
      style: c.kind === "text" ? { numFmt: "@" } : {},
    }));
    for (const row of ledger.rows) {
      sheet.addRow(
        Object.fromEntries(COLUMNS.map((c) => [c.key, xlsxValue(c, row)])),
      );
    }
    // Unlike carriers are never added: one totals line per carrier.
    for (const total of ledger.totals) {
      sheet.addRow({
        site_name: "Total",
        carrier: total.carrier,
        imports_kwh: Number(total.imports_kwh),
        exports_kwh: Number(total.exports_kwh),
        net_kwh: Number(total.net_kwh),
      }).font = { bold: true };
    }
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
