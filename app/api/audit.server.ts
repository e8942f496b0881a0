import type { NextFunction, Request, Response } from "express";
import { z } from "zod";
import {
  listAuditEntries,
  type AuditEntryView,
  type AuditFilters,
} from "~/audit/audit-trail.server";
import { sideText } from "~/audit/describe";
import { auditKinds } from "~/audit/kinds";
import { toCsv } from "~/lib/csv-export";
import { idSchema } from "~/lib/ids";
import { MONTH_PATTERN } from "~/lib/months";
import { formatCount } from "~/lib/format";
import { carriers } from "~/sites/meter-kinds";
import { isTimeZone } from "~/sites/site-schema";
import { sendError, sendValidationError } from "./respond.server";

/** A filter left empty in a form arrives as "": the same as not filtering. */
const optional = <T extends z.ZodType>(schema: T) =>
  z.union([z.literal(""), schema]).optional();

export const auditFiltersSchema = z.strictObject({
  site: optional(idSchema("site: expected a site id")),
  meter: optional(idSchema("meter: expected a meter id")),
  person: optional(z.string().max(128, "person: expected a person's id")),
  kind: optional(
    z.enum(auditKinds, { error: `kind: one of ${auditKinds.join(", ")}` }),
  ),
  from: optional(z.iso.date("from: expected a day as YYYY-MM-DD")),
  to: optional(z.iso.date("to: expected a day as YYYY-MM-DD")),
  tz: optional(
    z
      .string()
      .max(64)
      .refine(isTimeZone, "tz: expected an IANA time zone, e.g. Europe/London"),
  ),
  month: optional(
    z.string().regex(MONTH_PATTERN, "month: expected a month as YYYY-MM"),
  ),
  carrier: optional(
    z.enum(carriers, { error: `carrier: one of ${carriers.join(", ")}` }),
  ),
  since: optional(
    z.iso.datetime({
      offset: true,
      error: "since: expected an ISO 8601 date-time",
    }),
  ),
});

export const auditPageQuerySchema = auditFiltersSchema.extend({
  limit: optional(
    z.coerce
      .number({ error: "limit: expected a whole number" })
      .int("limit: expected a whole number")
      .min(1, "limit: at least 1")
      .max(500, "limit: at most 500"),
  ),
  before: optional(
    z.coerce
      .number({ error: "before: expected an entry id" })
      .int("before: expected an entry id")
      .positive("before: expected an entry id"),
  ),
});

type FilterQuery = z.infer<typeof auditFiltersSchema>;

/** The parsed query as filters; null (and a 400 sent) when it is not valid. */
function filtersFrom(query: FilterQuery, res: Response): AuditFilters | null {
  if (query.from && query.to && query.to < query.from) {
    sendError(
      res,
      400,
      "invalid_range",
      "from must not be after to (both are days, included).",
    );
    return null;
  }
  return {
    siteId: query.site || null,
    meterId: query.meter || null,
    personId: query.person || null,
    kind: query.kind || null,
    from: query.from || null,
    to: query.to || null,
    timeZone: query.tz || "UTC",
    month: query.month || null,
    carrier: query.carrier || null,
    since: query.since || null,
  };
}

const PAGE_SIZE = 200;

/** GET /api/v1/orgs/:orgId/audit: one page of entries, newest first. */
export async function getAuditEntries(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const parsed = auditPageQuerySchema.safeParse(req.query);
    if (!parsed.success) return sendValidationError(res, parsed.error);
    const filters = filtersFrom(parsed.data, res);
    if (!filters) return;
    const limit = parsed.data.limit || PAGE_SIZE;
    const page = await listAuditEntries({
      organizationId: res.locals.member!.organizationId,
      filters,
      limit,
      before: parsed.data.before || null,
    });
    res.json({
      entries: page.entries,
      next_before: page.more ? page.entries.at(-1)!.id : null,
    });
  } catch (error) {
    next(error);
  }
}

/** More rows than this in one file: narrow the filters instead. */
export const CSV_MAX_ROWS = 50_000;

const CSV_COLUMNS: readonly [string, (e: AuditEntryView) => string | number][] =
  [
    ["occurred_at_utc", (e) => e.occurred_at],
    ["kind", (e) => e.kind_label ?? ""],
    ["change", (e) => e.action_label],
    ["who", (e) => e.actor.name],
    ["site", (e) => e.site?.name ?? ""],
    ["meter", (e) => e.meter?.code ?? ""],
    ["subject", (e) => e.subject],
    ["reason", (e) => e.reason ?? ""],
    ["before", (e) => sideText(e.changes, "before")],
    ["after", (e) => sideText(e.changes, "after")],
    ["entry_id", (e) => e.id],
  ];

/**
 * GET …/audit.csv: every entry the filters match, in the page's words.
 * Written through the shared CSV writer, so a name or reason someone typed
 * as a formula opens in a spreadsheet as text.
 */
export async function getAuditCsv(
  req: Request,
  res: Response,
  next: NextFunction,
): Promise<void> {
  try {
    const parsed = auditFiltersSchema.safeParse(req.query);
    if (!parsed.success) return sendValidationError(res, parsed.error);
    const filters = filtersFrom(parsed.data, res);
    if (!filters) return;
    const { entries, more } = await listAuditEntries({
      organizationId: res.locals.member!.organizationId,
      filters,
      limit: CSV_MAX_ROWS,
    });
    if (more)
      return sendError(
        res,
        400,
        "too_many_entries",
        `More than ${formatCount(CSV_MAX_ROWS)} entries match; choose a shorter period or more filters.`,
      );
    const csv = toCsv(
      CSV_COLUMNS.map(([header]) => header),
      entries.map((entry) => CSV_COLUMNS.map(([, cell]) => cell(entry))),
    );
    const day = new Date().toISOString().slice(0, 10);
    res
      .type("text/csv; charset=utf-8")
      .attachment(`joulebook-audit-trail-${day}.csv`)
      .send(csv);
  } catch (error) {
    next(error);
  }
}
