/**
 * The JSON API's wire shapes as zod schemas: path parameters, query strings
 * and response bodies. This is a plain module on purpose: the route handlers
 * parse and answer with these schemas, `openapi.server.ts` turns them into
 * `/api/v1/openapi.json`, and the pages' data hooks take their types from
 * them (`z.output<…>`), so the three cannot drift apart.
 *
 * Request bodies with rules of their own, and the answers the domain's own
 * reads return, live beside their domain: `~/physics/evaluate-schema`,
 * `~/ingest/reading-schema`, `~/reports/report-request`,
 * `~/ledger/ledger-schema`, `~/ingest/interval-schema`,
 * `~/reports/verify-outcome`; they are re-exported here.
 */
import { z } from "zod";
import { idSchema } from "~/lib/ids";
import { MONTH_PATTERN } from "~/lib/months";
import { ledgerUnits } from "~/ledger/ledger-units";
import { reportSummarySchema } from "~/reports/report-summary";
import { intervalSchema } from "~/ingest/interval-schema";
import { carrier } from "~/lib/wire-schemas";
import { carriers, orientations } from "~/sites/meter-kinds";

// Shapes that live beside their domain, so the domain need not reach up
// into the API for them; the API's contract is still read from here.
export {
  carrierTotalSchema,
  ledgerRowSchema,
  ledgerSchema,
  type CarrierTotal,
  type Ledger,
  type LedgerRow,
} from "~/ledger/ledger-schema";
export { intervalSchema, type Interval } from "~/ingest/interval-schema";
export {
  verifyOutcomeSchema,
  type VerifyOutcome,
} from "~/reports/verify-outcome";

// ---------------------------------------------------------------- shared --

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

// --------------------------------------------------------------- reports --

export const reportListSchema = z.strictObject({
  reports: z.array(reportSummarySchema).describe("Newest first"),
});

export const reportQueuedSchema = z.strictObject({
  id: idSchema(),
  status: z.literal("queued"),
});

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
