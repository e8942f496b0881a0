/**
 * The JSON API's wire shapes as zod schemas: path parameters, query strings
 * and response bodies. This is a plain module on purpose: the route handlers
 * parse and answer with these schemas, `openapi.server.ts` turns them into
 * `/api/v1/openapi.json`, and the pages' data hooks take their types from
 * them (`z.output<…>`), so the three cannot drift apart.
 *
 * Request bodies with rules of their own live beside their domain:
 * `~/physics/evaluate-schema`, `~/ingest/reading-schema`,
 * `~/reports/report-request`.
 */
import { z } from "zod";
import { idSchema } from "~/lib/ids";
import { MONTH_PATTERN } from "~/lib/months";
import { intervalQualities } from "~/ingest/series";
import { ledgerUnits } from "~/ledger/ledger-units";
import { reportSummarySchema } from "~/reports/report-summary";
import { carriers, orientations } from "~/sites/meter-kinds";

// ---------------------------------------------------------------- shared --

/** Exact PostgreSQL numerics travel as decimal text, never as doubles. */
const decimalKwh = (description: string) =>
  z
    .string()
    .regex(/^-?\d+(\.\d+)?$/)
    .describe(`${description}, kWh as exact decimal text`);

const carrier = z.enum(carriers);

/** Every API error: a code, a sentence, and (for `invalid_body`) field issues. */
export const errorBodySchema = z.strictObject({
  error: z.strictObject({
    code: z.string().describe("Stable, e.g. invalid_body, not_found"),
    message: z.string().describe("A sentence for people"),
    issues: z
      .array(
        z.strictObject({
          path: z.string().describe("e.g. items.3.volume_m3, or (body)"),
          message: z.string(),
        }),
      )
      .optional(),
  }),
});
export type ApiErrorBody = z.output<typeof errorBodySchema>;

// ---------------------------------------------------------- path params --

export const orgPathSchema = z.strictObject({
  orgId: idSchema().describe("The organisation; another's answers 404"),
});
export const meterPathSchema = orgPathSchema.extend({ meterId: idSchema() });
export const reportPathSchema = orgPathSchema.extend({ reportId: idSchema() });

// ---------------------------------------------------------------- health --

export const healthSchema = z.strictObject({
  status: z.enum(["ok", "degraded"]),
  database: z.enum(["reachable", "unreachable"]),
  time: z.iso.datetime(),
});

// ---------------------------------------------------------------- ingest --

export const itemProblemSchema = z.strictObject({
  index: z.number().int().describe("The reading's position in the batch"),
  meter: z.string().optional(),
  reason: z.string(),
});

export const ingestAnswerSchema = z.strictObject({
  batch_id: idSchema(),
  accepted: z.number().int(),
  repeats: z
    .number()
    .int()
    .describe("Readings already stored with the same values: no change"),
  rejected: z.array(itemProblemSchema),
  conflicts: z
    .array(itemProblemSchema)
    .describe("Different readings for a key already stored: kept for review"),
});
export type IngestAnswer = z.output<typeof ingestAnswerSchema>;

// ------------------------------------------------------------- intervals --

const instantParam = (name: string) =>
  z.iso.datetime({
    offset: true,
    error: `${name}: expected an ISO 8601 date-time`,
  });

export const intervalsQuerySchema = z.strictObject({
  from: instantParam("from").optional(),
  to: instantParam("to")
    .optional()
    .describe("At most 93 days after from; default: the newest week"),
});

export const intervalSchema = z.strictObject({
  hour_start: z.iso.datetime(),
  energy_kwh: decimalKwh("Signed energy of the hour (into the site +)"),
  quality: z.enum(intervalQualities),
  flags: z.array(z.string()),
  estimate_method: z.string().nullable(),
  source_count: z.number().int().describe("Readings behind the hour"),
});
export type Interval = z.output<typeof intervalSchema>;

export const intervalPageSchema = z.strictObject({
  meter: z.strictObject({
    id: idSchema(),
    code: z.string(),
    name: z.string(),
    carrier,
    orientation: z.enum(orientations),
    time_zone: z.string(),
  }),
  from: z.iso.datetime(),
  to: z.iso.datetime(),
  latest: z.iso.datetime().nullable().describe("The newest stored hour"),
  intervals: z.array(intervalSchema).describe("Oldest first"),
});
export type IntervalPage = z.output<typeof intervalPageSchema>;

// ---------------------------------------------------------------- ledger --

const monthParam = (name: string) =>
  z.string().regex(MONTH_PATTERN, `${name}: expected a month as YYYY-MM`);

/** Shared by the JSON ledger and its CSV and XLSX exports. */
export const ledgerQuerySchema = z.strictObject({
  from: monthParam("from").describe("First month, YYYY-MM"),
  to: monthParam("to").describe("Last month, YYYY-MM; at most 120 months"),
  site: z
    .union([z.literal(""), idSchema("site: expected a site id")])
    .optional()
    .describe("One site; empty or absent: every site"),
  carrier: z
    .enum(["", ...carriers], {
      error: "carrier: heat, cooling, steam or electricity",
    })
    .optional()
    .describe("One carrier; empty or absent: every carrier"),
});

/**
 * The exports follow the screen: the ledger's filters plus the unit and the
 * per-m² choice. The JSON ledger stays in kWh, its field names a contract.
 */
export const ledgerExportQuerySchema = ledgerQuerySchema.extend({
  unit: z
    .enum(ledgerUnits, { error: `unit: ${ledgerUnits.join(", ")}` })
    .optional()
    .describe("The unit of the figures; kWh when absent"),
  per: z
    .enum(["", "m2"], { error: "per: m2, or leave it out" })
    .optional()
    .describe("m2: figures per square metre of the site's floor area"),
});

/**
 * One site × month × carrier: delivered (imports, ≥ 0) and exported
 * (exports, ≤ 0) energy of that carrier. Chilled water is cooling delivered,
 * a positive figure.
 */
export const ledgerRowSchema = z.strictObject({
  site_id: idSchema(),
  site_name: z.string(),
  floor_area_m2: z.string().nullable().describe("Decimal text, m²"),
  month: z.string().regex(MONTH_PATTERN),
  carrier,
  imports_kwh: decimalKwh("Delivered, ≥ 0"),
  exports_kwh: decimalKwh("Exported, ≤ 0"),
  net_kwh: decimalKwh("imports + exports"),
  estimated_kwh: decimalKwh("The estimated part"),
  estimated_share: z.number().describe("Estimated share of the energy, 0–1"),
  uncertainty_kwh: decimalKwh("EN 1434 band (heat and cooling)").nullable(),
  status: z.enum(["open", "closed"]),
  adjustments_kwh: decimalKwh("Changes since the month was closed"),
  adjustment_count: z.number().int(),
  closed_at: z
    .string()
    .nullable()
    .describe(
      "When a closed month was closed (ISO 8601); its adjusting entries are those since",
    ),
});
export type LedgerRow = z.output<typeof ledgerRowSchema>;

/** One carrier's sums over every row: unlike carriers are never added. */
export const carrierTotalSchema = z.strictObject({
  carrier,
  imports_kwh: decimalKwh("Delivered"),
  exports_kwh: decimalKwh("Exported"),
  net_kwh: decimalKwh("Net"),
});
export type CarrierTotal = z.output<typeof carrierTotalSchema>;

export const ledgerSchema = z.strictObject({
  from: z.string().regex(MONTH_PATTERN),
  to: z.string().regex(MONTH_PATTERN),
  rows: z.array(ledgerRowSchema).describe("By site name, month, carrier"),
  totals: z
    .array(carrierTotalSchema)
    .describe("One per carrier in the rows, in carrier order"),
});
export type Ledger = z.output<typeof ledgerSchema>;

// --------------------------------------------------------------- reports --

export const reportListSchema = z.strictObject({
  reports: z.array(reportSummarySchema).describe("Newest first"),
});

export const reportQueuedSchema = z.strictObject({
  id: idSchema(),
  status: z.literal("queued"),
});

const signature = {
  sha256: z.string().describe("Hex SHA-256 of the whole file"),
  signerName: z.string(),
  signedAt: z.iso.datetime().nullable(),
};

export const verifyOutcomeSchema = z.discriminatedUnion("verdict", [
  z.strictObject({
    verdict: z.literal("genuine"),
    ...signature,
    report: z.strictObject({
      id: idSchema(),
      title: z.string(),
      completedAt: z.iso.datetime().nullable(),
      authorName: z.string().nullable(),
      authorEmail: z.string().nullable(),
    }),
  }),
  z.strictObject({
    verdict: z.literal("not_issued_here"),
    ...signature,
    message: z.string(),
  }),
  z.strictObject({
    verdict: z.literal("invalid"),
    reason: z.enum([
      "not_a_pdf",
      "no_signature",
      "malformed_signature",
      "truncated",
      "not_whole_document",
      "digest_mismatch",
      "bad_signature",
      "untrusted_certificate",
    ]),
    message: z.string(),
  }),
]);
export type VerifyOutcome = z.output<typeof verifyOutcomeSchema>;

// --------------------------------------------------------------- billing --

/** What the webhook reads of Stripe's event; the rest passes through. */
export const stripeEventSchema = z.looseObject({
  id: z.string(),
  type: z.string(),
  data: z.looseObject({}),
});

export const webhookAnswerSchema = z.strictObject({
  received: z.literal(true),
  id: z.string(),
  outcome: z.enum(["applied", "duplicate", "ignored"]),
});

/** One entry of the audit trail, in the page's words and as stored. */
export const auditEntrySchema = z.strictObject({
  id: z.number().int(),
  occurred_at: z.string().describe("ISO 8601"),
  action: z.string().describe("The stored action, e.g. interval.edited"),
  action_label: z.string(),
  kind: z.string().nullable(),
  kind_label: z.string().nullable(),
  actor: z.strictObject({
    type: z.enum(["person", "gateway", "system"]),
    id: z.string().nullable(),
    name: z.string(),
  }),
  site: z.strictObject({ id: idSchema(), name: z.string() }).nullable(),
  meter: z
    .strictObject({ id: idSchema(), code: z.string(), name: z.string() })
    .nullable(),
  subject: z.string(),
  reason: z.string().nullable(),
  changes: z.array(
    z.strictObject({
      field: z.string(),
      before: z.string(),
      after: z.string(),
    }),
  ),
  before: z.record(z.string(), z.unknown()).nullable(),
  after: z.record(z.string(), z.unknown()).nullable(),
  details: z.record(z.string(), z.unknown()),
});

export const auditPageSchema = z.strictObject({
  entries: z.array(auditEntrySchema),
  next_before: z
    .number()
    .int()
    .nullable()
    .describe("Pass as `before` for the next page; null on the last"),
});
