import type { NextFunction, Request, Response } from "express";
import type { z } from "zod";
import { monthCount } from "~/lib/months";
import { toCsv } from "~/lib/csv-export";
import {
  exportFilename,
  ledgerExport,
  type ExportOptions,
} from "~/ledger/ledger-export";
import { withReadSource } from "~/db/read-source.server";
import { ledgerRows } from "~/ledger/ledger-rows.server";
import { ledgerXlsx } from "~/ledger/ledger-xlsx.server";
import { carrierLabels, carriers } from "~/sites/meter-kinds";
import { getSite } from "~/sites/sites.server";
import { sendError, sendValidationError } from "./respond.server";
import {
  ledgerExportQuerySchema as exportQuerySchema,
  ledgerQuerySchema as querySchema,
  type Ledger,
} from "./schemas";

/** Ten years of months at most per request. */
const MAX_MONTHS = 120;

type LedgerQuery = z.infer<typeof querySchema>;

/** The query parsed by `schema`, or null once a 400 has been sent. */
function parseQuery<T extends LedgerQuery>(
  schema: z.ZodType<T>,
  req: Request,
  res: Response,
): T | null {
  const parsed = schema.safeParse(req.query);
  if (parsed.success) return parsed.data;
  sendValidationError(res, parsed.error);
  return null;
}

async function loadLedger(
  query: LedgerQuery,
  req: Request,
  res: Response,
): Promise<Ledger | null> {
  const { from, to, site, carrier } = query;
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
  const ledgerQuery = {
    organizationId: res.locals.member!.organizationId,
    from,
    to,
    siteId: site || null,
    carrier: carrier || null,
  };
  // The standby when there is one, unless this person has just written.
  return withReadSource(req.headers.cookie, (source) =>
    ledgerRows(ledgerQuery, source.pool),
  );
}

/** GET /api/v1/orgs/:orgId/ledger: the grid, the exports and outside tools read this. */
export async function getLedger(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const query = parseQuery(querySchema, req, res);
    const ledger = query && (await loadLedger(query, req, res));
    if (ledger) res.json(ledger);
  } catch (error) {
    next(error);
  }
}

interface LoadedExport {
  ledger: Ledger;
  options: ExportOptions;
  query: z.infer<typeof exportQuerySchema>;
}

async function loadExport(
  req: Request,
  res: Response,
): Promise<LoadedExport | null> {
  const query = parseQuery(exportQuerySchema, req, res);
  const ledger = query && (await loadLedger(query, req, res));
  if (!query || !ledger) return null;
  return {
    ledger,
    query,
    options: { unit: query.unit ?? "kWh", perM2: query.per === "m2" },
  };
}

/**
 * GET …/ledger.csv: the grid as on screen, in the chosen unit, with a total
 * row per carrier. Figures are exact decimals; names are neutralised against
 * formulas by toCsv.
 */
export async function getLedgerCsv(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const loaded = await loadExport(req, res);
    if (!loaded) return;
    const table = ledgerExport(loaded.ledger, loaded.options);
    const csv = toCsv(
      table.columns.map((c) => c.header),
      table.lines.map((line) => line.cells),
    );
    res
      .type("text/csv; charset=utf-8")
      .attachment(exportFilename(loaded.ledger, loaded.options, "csv"))
      .send(csv);
  } catch (error) {
    next(error);
  }
}

/** GET …/ledger.xlsx: the same table, with number formats and bold totals. */
export async function getLedgerXlsx(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const loaded = await loadExport(req, res);
    if (!loaded) return;
    const { ledger, options, query } = loaded;
    const site = query.site
      ? await getSite({
          organizationId: res.locals.member!.organizationId,
          siteId: query.site,
        })
      : null;
    const buffer = await ledgerXlsx(ledgerExport(ledger, options), {
      ...options,
      from: ledger.from,
      to: ledger.to,
      sites: site?.name ?? (query.site ? "No such site" : "All sites"),
      carriers: query.carrier
        ? carrierLabels[query.carrier as (typeof carriers)[number]]
        : "All carriers",
    });
    res
      .type("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet")
      .attachment(exportFilename(ledger, options, "xlsx"))
      .send(buffer);
  } catch (error) {
    next(error);
  }
}
