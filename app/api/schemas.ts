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
import {
  carriers,
  meterPositions,
  isIntervalMinutes,
  orientations,
  quantities,
  sensorPositions,
} from "~/sites/meter-kinds";

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
  processes: z
    .number()
    .int()
    .min(1)
    .describe(
      "Server processes serving on this port (WEB_CONCURRENCY), as their primary counts them",
    ),
  time: z.iso.datetime(),
  // Only with DATABASE_READ_URL; reads fall back to the primary while the
  // standby is unreachable, so it does not make the status degraded.
  standby: z
    .strictObject({
      status: z
        .enum(["replaying", "unreachable", "not_a_standby"])
        .describe(
          "replaying: in recovery, serving reads; not_a_standby: DATABASE_READ_URL names a server that is not in recovery",
        ),
      lag_bytes: z
        .number()
        .nullable()
        .describe(
          "WAL the primary has written that the standby has not replayed",
        ),
      lag_seconds: z
        .number()
        .nullable()
        .describe(
          "Seconds since the standby last replayed a transaction; 0 when caught up",
        ),
    })
    .optional()
    .describe("The read replica (DATABASE_READ_URL), when one is configured"),
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
    interval_minutes: z
      .number()
      .int()
      .describe("Minutes per interval: 15, 30 or 60"),
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
      error: `carrier: one of ${carriers.join(", ")}`,
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
    type: z.enum(["person", "gateway", "token", "system"]),
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

// ---------------------------------------------------------- provisioning --
// Sites and meters over the API. The bodies are checked for JSON types here;
// the rules (lengths, ranges, time zones, carrier for quantity…) are the
// pages' form schemas, applied by provisioning.server.ts.

export const sitePathSchema = orgPathSchema.extend({ siteId: idSchema() });

const decimalOrNull = z.number().nullable();

export const siteCreateBodySchema = z.strictObject({
  name: z.string(),
  time_zone: z.string().describe("IANA time zone, e.g. Europe/London"),
  floor_area_m2: decimalOrNull.optional(),
  degree_day_base_c: z.number().optional().describe("°C; 15.5 if left out"),
  address: z.string().optional(),
});
export const siteUpdateBodySchema = siteCreateBodySchema.partial();

export const siteSchema = z.strictObject({
  id: z.guid(),
  name: z.string(),
  time_zone: z.string(),
  floor_area_m2: z.number().nullable(),
  degree_day_base_c: z.number(),
  address: z.string(),
  created_at: z.iso.datetime({ offset: true }),
  archived_at: z.iso.datetime({ offset: true }).nullable(),
});
export type ApiSite = z.output<typeof siteSchema>;
export const siteListSchema = z.strictObject({ sites: z.array(siteSchema) });

/** A meter's resolution: 15, 30 or 60 minutes per interval. */
const intervalMinutes = z
  .number()
  .refine(isIntervalMinutes, {
    message: "interval_minutes must be 15, 30 or 60.",
  })
  .describe(
    "Minutes per interval: 15, 30 or 60 (60 if left out); fixed once the meter has intervals",
  );

const meterSettingsShape = {
  code: z.string().describe("What gateways put in a reading's `meter`"),
  name: z.string(),
  quantity: z.enum(quantities),
  carrier: z.enum(carriers),
  orientation: z.enum(orientations),
  interval_minutes: intervalMinutes.optional(),
  parent_meter_id: z.guid().nullable().optional(),
  position: z
    .enum(meterPositions)
    .optional()
    .describe(
      "boundary (default): counted as delivered or exported; internal: a " +
        "plant's input or output inside the site, kept out of every total",
    ),
  serial: z.string().optional(),
  multiplier: z.number().optional(),
  rollover_kwh: decimalOrNull.optional(),
  sensor_at: z.enum(sensorPositions).nullable().optional(),
  default_pressure_bar_abs: decimalOrNull.optional(),
  spike_factor: z.number().optional(),
  accuracy_class: z
    .union([z.literal(1), z.literal(2), z.literal(3)])
    .nullable()
    .optional(),
  delta_theta_min_k: decimalOrNull.optional(),
  qp_m3_per_h: decimalOrNull.optional(),
  installed_at: z.string().describe("YYYY-MM-DD or a date-time"),
};

export const meterCreateBodySchema = z.strictObject({
  site_id: z.guid(),
  ...meterSettingsShape,
});
/** A meter stays on its site: site_id cannot be changed. */
export const meterUpdateBodySchema = z
  .strictObject(meterSettingsShape)
  .partial();

export const meterArchiveBodySchema = z.strictObject({
  removed_at: z
    .string()
    .optional()
    .describe("YYYY-MM-DD or a date-time; now if left out"),
  reason: z.string().optional(),
});

export const meterSchema = z.strictObject({
  id: z.guid(),
  site_id: z.guid(),
  code: z.string(),
  name: z.string(),
  quantity: z.enum(quantities),
  carrier: z.enum(carriers),
  orientation: z.enum(orientations),
  interval_minutes: z.union([z.literal(15), z.literal(30), z.literal(60)]),
  parent_meter_id: z.guid().nullable(),
  position: z.enum(meterPositions),
  serial: z.string(),
  multiplier: z.number(),
  rollover_kwh: z.number().nullable(),
  sensor_at: z.enum(sensorPositions).nullable(),
  default_pressure_bar_abs: z.number().nullable(),
  spike_factor: z.number(),
  accuracy_class: z.number().int().nullable(),
  delta_theta_min_k: z.number().nullable(),
  qp_m3_per_h: z.number().nullable(),
  installed_at: z.iso.datetime({ offset: true }),
  removed_at: z.iso.datetime({ offset: true }).nullable(),
  replaced_by_meter_id: z.guid().nullable(),
});
export type ApiMeter = z.output<typeof meterSchema>;
export const meterListSchema = z.strictObject({ meters: z.array(meterSchema) });
export const meterListQuerySchema = z.strictObject({
  site_id: z.guid().optional().describe("Only this site's meters"),
});
