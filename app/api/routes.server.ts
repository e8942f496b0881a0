/**
 * Every route of the JSON API under /api/v1, in the order Express tries them.
 * To add a route: add one entry here (its handler in its own module, its
 * schemas in ./schemas.ts or beside its domain). router.server.ts registers
 * it and openapi.server.ts documents it; tests/integration/openapi.test.ts
 * fails if a route of the router is missing from the document.
 */
import { z } from "zod";
import {
  wellFormedReadingBatchSchema,
  MAX_READINGS_PER_BATCH,
} from "~/ingest/reading-schema";
import {
  evaluateResponseSchema,
  MAX_EVALUATE_ITEMS,
  wellFormedEvaluateRequestSchema,
} from "~/physics/evaluate-schema";
import { reportRequestSchema } from "~/reports/report-request";
import {
  anyone,
  errorReply,
  fileReply,
  jsonReply,
  member,
  type ApiRoute,
} from "./api-route.server";
import {
  auditFiltersSchema,
  auditPageQuerySchema,
  getAuditCsv,
  getAuditEntries,
} from "./audit.server";
import { stripeWebhook, WEBHOOK_BODY_LIMIT } from "./billing-webhook.server";
import { evaluateEnergy, EVALUATE_BODY_LIMIT } from "./evaluate.server";
import { health } from "./health.server";
import { getIntervals } from "./intervals.server";
import { getLedger, getLedgerCsv, getLedgerXlsx } from "./ledger.server";
import { openApiDocument } from "./openapi.server";
import {
  gatewayRateLimit,
  postReadings,
  READINGS_BODY_LIMIT,
} from "./readings.server";
import {
  getReportPdf,
  getReports,
  postReport,
  postVerify,
  VERIFY_BODY_LIMIT,
} from "./reports.server";
import {
  auditPageSchema,
  healthSchema,
  ingestAnswerSchema,
  intervalPageSchema,
  intervalsQuerySchema,
  ledgerExportQuerySchema,
  ledgerQuerySchema,
  ledgerSchema,
  meterPathSchema,
  orgPathSchema,
  reportListSchema,
  reportPathSchema,
  reportQueuedSchema,
  stripeEventSchema,
  verifyOutcomeSchema,
  webhookAnswerSchema,
} from "./schemas";
import { uploadReadings } from "./upload-readings.server";
import { provisioningRoutes } from "./provisioning-routes.server";
import { tankRoutes } from "./tank-routes.server";
import { gasSupplyRoutes } from "./gas-supply-routes.server";
import { carbonRoutes } from "./carbon-routes.server";
import { tariffRoutes } from "./tariff-routes.server";
import { supplierBillRoutes } from "./supplier-bill-routes.server";
import { budgetRoutes } from "./budget-routes.server";
import { formatCount } from "~/lib/format";

/** One interval reading and one register reading, as a gateway sends them. */
const readingBatchExample = {
  readings: [
    {
      meter: "HM-01",
      quantity: "water_heat",
      start: "2026-03-01T00:00:00Z",
      end: "2026-03-01T01:00:00Z",
      volume_m3: 2.41,
      flow_temp_c: 71.5,
      return_temp_c: 44,
      pressure_bar_abs: 6,
      sensor_at: "return",
    },
    {
      meter: "EM-01",
      quantity: "electric_register",
      time: "2026-03-01T01:00:00Z",
      register_kwh: 48211.5,
    },
  ],
};

const ledgerExport = (ext: "csv" | "xlsx", mediaType: string) => ({
  summary: `The ledger as ${ext.toUpperCase()}, for spreadsheets`,
  description:
    ext === "csv"
      ? "The grid as on screen: the JSON ledger's filters plus `unit` and `per`; readable headings with the unit, exact decimals, the ± column and a total row per carrier (unlike carriers are never added). Names are neutralised against spreadsheet formulas. Sent as an attachment."
      : "The same table as numbers in the unit's number format, months as dates, one bold total row per carrier and a Notes sheet. Names stay text. Sent as an attachment.",
  access: member("ledger.view"),
  params: orgPathSchema,
  query: ledgerExportQuerySchema,
  responses: {
    200: fileReply(`The ledger file`, mediaType, {
      "Content-Disposition": `attachment; filename="joulebook-ledger-<from>-to-<to>-<unit>[-per-m2].${ext}"`,
    }),
    400: errorReply("A bad month, site or carrier, or more than 120 months"),
  },
});

/** The table, fresh per router: the rate limiter keeps its own counts. */
export function apiRoutes(): ApiRoute[] {
  const routes: ApiRoute[] = [
    {
      // Stripe signs the exact bytes: this route reads the raw body, and no
      // JSON parser may run before it.
      method: "post",
      path: "/billing/webhook",
      summary: "Stripe's billing events (called by Stripe, not by people)",
      description:
        "Signed with the Stripe-Signature header over the raw body. Each event is applied once, keyed by its id, in the same transaction as its effect; a repeat answers 200 without changing anything. Events for customers Joulebook does not know are recorded and ignored. Answered only after the commit.",
      access: { kind: "stripe" },
      headers: z.object({
        "Stripe-Signature": z
          .string()
          .describe("t=<unix time>,v1=<HMAC-SHA256 of t.body>"),
      }),
      body: {
        kind: "raw",
        mediaType: "application/json",
        limit: WEBHOOK_BODY_LIMIT,
        schema: stripeEventSchema,
      },
      handler: stripeWebhook,
      responses: {
        200: jsonReply(
          "Recorded: applied, a repeat, or ignored",
          webhookAnswerSchema,
        ),
        400: errorReply(
          "Missing or wrong signature (`invalid_signature`); nothing changed",
        ),
      },
    },
    {
      method: "get",
      path: "/health",
      summary: "Liveness and database reachability",
      access: anyone,
      handler: health,
      responses: {
        200: jsonReply("Serving, database reachable", healthSchema),
        503: jsonReply("Serving, database unreachable", healthSchema),
      },
    },
    {
      method: "get",
      path: "/openapi.json",
      summary: "This document: the OpenAPI 3.1 description of /api/v1",
      access: anyone,
      handler: (_req, res) => {
        res.json(document());
      },
      responses: {
        200: jsonReply(
          "Generated from the route table and its zod schemas",
          z.looseObject({ openapi: z.literal("3.1.0") }),
        ),
      },
    },
    {
      method: "post",
      path: "/energy/evaluate",
      summary: "Turn measured quantities into energy (nothing is stored)",
      description: `Up to ${formatCount(MAX_EVALUATE_ITEMS)} items. Results come back in item order; an item that fails answers \`ok: false\` with a plain reason and never fails the others.`,
      access: { kind: "gatewayOrSession" },
      body: {
        kind: "json",
        limit: EVALUATE_BODY_LIMIT,
        schema: wellFormedEvaluateRequestSchema,
        example: {
          items: [
            {
              quantity: "electric_work",
              circuit: "three_phase",
              volts: 400,
              amps: 31.5,
              power_factor: 0.93,
              seconds: 3600,
            },
          ],
        },
      },
      handler: evaluateEnergy,
      responses: {
        200: jsonReply("One result per item, in order", evaluateResponseSchema),
        400: errorReply(
          `The body is not JSON or not an object with 1–${formatCount(MAX_EVALUATE_ITEMS)} items`,
        ),
        401: errorReply("No valid gateway key or session"),
        413: errorReply("Body larger than 8 MB"),
      },
    },
    {
      method: "post",
      path: "/readings",
      summary: "A gateway's batch of readings",
      description: `Up to ${formatCount(MAX_READINGS_PER_BATCH)} readings or 5 MB. Idempotent on (meter, reading time): the same reading again is a repeat; a different one at the same key is a conflict, kept for review and not applied. A key only reaches its own organisation's meters. Acknowledged only after the batch is committed.`,
      access: { kind: "gateway" },
      before: [gatewayRateLimit()],
      body: {
        kind: "json",
        limit: READINGS_BODY_LIMIT,
        schema: wellFormedReadingBatchSchema,
        example: readingBatchExample,
      },
      handler: postReadings,
      responses: {
        200: jsonReply(
          "What was stored, repeated, rejected (with index and reason) and in conflict",
          ingestAnswerSchema,
        ),
        400: errorReply("Not JSON, or not `{ readings: [...] }`"),
        401: errorReply("No gateway key, or an unknown or revoked one"),
        413: errorReply(
          `More than ${formatCount(MAX_READINGS_PER_BATCH)} readings or 5 MB`,
        ),
        429: {
          ...errorReply("This gateway's rate limit; see Retry-After"),
          headers: { "Retry-After": "Seconds to wait" },
        },
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/ledger",
      summary: "The monthly ledger: delivered and exported energy per carrier",
      description:
        "One row per site, month and carrier: imports_kwh (delivered, ≥ 0), exports_kwh (exported, ≤ 0) and net_kwh, with the estimated part, the EN 1434 band, the month's status and the changes since it was closed. Chilled water is cooling delivered, a positive figure. `totals` has one entry per carrier: unlike carriers are never added. The Ledger page, its exports and outside tools read this.",
      access: member("ledger.view"),
      params: orgPathSchema,
      query: ledgerQuerySchema,
      handler: getLedger,
      responses: {
        200: jsonReply("The rows and the totals per carrier", ledgerSchema),
        400: errorReply(
          "A bad month, site or carrier, or more than 120 months",
        ),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/audit",
      summary:
        "The audit trail: every change, who, when, why, before and after",
      description:
        "Owners and auditors. Newest first, a page at a time (`limit`, then `before` = the last id). Filters: site, meter, person, kind, a period of days (`from`, `to` in `tz`) or a ledger month and carrier (`month`, `carrier`, `since`: the adjusting entries of a closed month).",
      access: member("audit.view"),
      params: orgPathSchema,
      query: auditPageQuerySchema,
      handler: getAuditEntries,
      responses: {
        200: jsonReply("One page of entries", auditPageSchema),
        400: errorReply("A bad filter or range"),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/audit.csv",
      summary: "The audit trail as CSV",
      description:
        "Every entry the filters match (at most 50,000), in the page's words; text someone typed that a spreadsheet would read as a formula is neutralised. Sent as an attachment.",
      access: member("audit.view"),
      params: orgPathSchema,
      query: auditFiltersSchema,
      handler: getAuditCsv,
      responses: {
        200: fileReply("The audit trail file", "text/csv", {
          "Content-Disposition":
            'attachment; filename="joulebook-audit-trail-<day>.csv"',
        }),
        400: errorReply("A bad filter, or too many entries for one file"),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/ledger.csv",
      ...ledgerExport("csv", "text/csv"),
      handler: getLedgerCsv,
    },
    {
      method: "get",
      path: "/orgs/:orgId/ledger.xlsx",
      ...ledgerExport(
        "xlsx",
        "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
      ),
      handler: getLedgerXlsx,
    },
    {
      method: "get",
      path: "/orgs/:orgId/meters/:meterId/intervals",
      summary: "A meter's hourly intervals (signed kWh, quality, flags)",
      access: member("readings.view"),
      params: meterPathSchema,
      query: intervalsQuerySchema,
      handler: getIntervals,
      responses: {
        200: jsonReply(
          "The meter and its intervals, oldest first",
          intervalPageSchema,
        ),
        400: errorReply("A bad date-time, to not after from, or over 93 days"),
        404: errorReply("No such meter in an organisation you belong to"),
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/readings",
      summary:
        "Upload readings as a signed-in energy manager (the CSV page sends these)",
      access: member("readings.edit"),
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: READINGS_BODY_LIMIT,
        schema: wellFormedReadingBatchSchema,
        example: readingBatchExample,
      },
      handler: uploadReadings,
      responses: {
        200: jsonReply("As for /readings", ingestAnswerSchema),
        403: errorReply("The role may not edit readings"),
        413: errorReply(
          `More than ${formatCount(MAX_READINGS_PER_BATCH)} readings or 5 MB`,
        ),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/reports",
      summary: "The organisation's signed reports, newest first",
      access: member("reports.download"),
      params: orgPathSchema,
      handler: getReports,
      responses: {
        200: jsonReply(
          "`{ reports: [...] }` without the PDF bytes",
          reportListSchema,
        ),
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/reports",
      summary: "Request a signed report (owners and energy managers)",
      description:
        'Made in the background: answered 202 with the report id; poll the list until its status is "done". `period` is `month:YYYY-MM`, `quarter:YYYY-Qn` or `year:YYYY`; `scope` is "all" or a site id.',
      access: member("reports.create"),
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: "10kb",
        schema: reportRequestSchema,
        example: { scope: "all", period: "year:2025" },
      },
      handler: postReport,
      responses: {
        202: jsonReply('`{ id, status: "queued" }`', reportQueuedSchema),
        400: errorReply("A bad scope or period"),
        403: errorReply("The role may not make reports"),
      },
    },
    // Before the :reportId routes, so "verify" is never taken for an id.
    {
      method: "post",
      path: "/orgs/:orgId/reports/verify",
      summary: "Check a PDF (owners and auditors)",
      description:
        'The verdict is "genuine" (signature valid, covering the whole file, and the SHA-256 of a report this organisation issued: which one, when, by whom), "not_issued_here" (validly signed but not one of this organisation\'s reports) or "invalid" with the reason (not_a_pdf, no_signature, malformed_signature, truncated, not_whole_document, digest_mismatch, bad_signature, untrusted_certificate) and a sentence saying why.',
      access: member("reports.verify"),
      params: orgPathSchema,
      body: {
        kind: "raw",
        mediaType: "application/pdf",
        limit: VERIFY_BODY_LIMIT,
      },
      handler: postVerify,
      responses: {
        200: jsonReply("The verdict", verifyOutcomeSchema),
        400: errorReply("No body"),
        403: errorReply("The role may not verify"),
        413: errorReply("Larger than 25 MB"),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/reports/:reportId/pdf",
      summary: "The signed PDF, byte for byte as stored",
      description:
        "X-Content-SHA256 carries the SHA-256 that Verify matches against.",
      access: member("reports.download"),
      params: reportPathSchema,
      handler: getReportPdf,
      responses: {
        200: fileReply("The PDF", "application/pdf", {
          "X-Content-SHA256": "Hex SHA-256 of the bytes",
          ETag: "The same SHA-256, quoted",
        }),
        404: errorReply("No such report here, or not finished"),
      },
    },
    ...provisioningRoutes(),
    ...tankRoutes(),
    ...gasSupplyRoutes(),
    ...carbonRoutes(),
    ...tariffRoutes(),
    ...supplierBillRoutes(),
    ...budgetRoutes(),
  ];
  let cached: ReturnType<typeof openApiDocument> | undefined;
  const document = () => (cached ??= openApiDocument(routes));
  return routes;
}
