import { sql } from "drizzle-orm";
import {
  bigserial,
  boolean,
  check,
  customType,
  date,
  foreignKey,
  index,
  integer,
  jsonb,
  numeric,
  pgEnum,
  pgTable,
  primaryKey,
  smallint,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
// Relative imports: drizzle-kit loads this file without the app's `~/` alias.
import { NO_DATA_AFTER_HOURS } from "../alerts/no-data";
import { roles } from "../auth/permissions";
import { intervalQualities } from "../ingest/series";
import { plantKinds, plantMeterRoles } from "../plant/plant-roles";
import {
  carriers,
  meterPositions,
  DEFAULT_INTERVAL_MINUTES,
  intervalResolutions,
  orientations,
  quantities,
  sensorPositions,
} from "../sites/meter-kinds";

/**
 * Tables shared by every organisation (people and their sessions) have a plain
 * key. Every tenant table starts its primary key with organization_id so that a
 * distributed PostgreSQL can shard the estate by organisation (docs/scaling.md).
 */

export const roleEnum = pgEnum("member_role", roles);

const createdAt = () =>
  timestamp("created_at", { withTimezone: true, mode: "date" })
    .notNull()
    .defaultNow();

export const users = pgTable(
  "users",
  {
    id: text("id").primaryKey(),
    email: text("email").notNull(),
    name: text("name").notNull(),
    passwordHash: text("password_hash").notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("users_email_unique").on(sql`lower(${t.email})`)],
);

export const sessions = pgTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: timestamp("expires_at", {
      withTimezone: true,
      mode: "date",
    }).notNull(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

export const passwordResetTokens = pgTable(
  "password_reset_tokens",
  {
    tokenHash: text("token_hash").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    usedAt: timestamp("used_at", { withTimezone: true }),
    /** Set when a password change or another used link ended this one. */
    endedAt: timestamp("ended_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [index("password_reset_user_idx").on(t.userId)],
);

/**
 * Every attempt at something a stranger may repeat (signing in, signing up,
 * asking for a reset link), kept to throttle guessing per e-mail address and
 * per client (app/auth/throttle.server.ts). `device_hash` names the browser a
 * sign-in came from when it carried a trusted-device cookie.
 */
export const attemptKindEnum = pgEnum("attempt_kind", [
  "sign-in",
  "sign-up",
  "password-reset",
]);

export const signInAttempts = pgTable(
  "sign_in_attempts",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    kind: attemptKindEnum("kind").notNull().default("sign-in"),
    email: text("email").notNull(),
    clientAddress: text("client_address").notNull(),
    deviceHash: text("device_hash"),
    succeeded: boolean("succeeded").notNull(),
    attemptedAt: timestamp("attempted_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    index("sign_in_attempts_email_idx").on(t.kind, t.email, t.attemptedAt),
    index("sign_in_attempts_client_idx").on(
      t.kind,
      t.clientAddress,
      t.attemptedAt,
    ),
  ],
);

export const organizations = pgTable(
  "organizations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    name: text("name").notNull(),
    /** The month (1–12) a financial year starts in; 1 is the calendar year. */
    financialYearStartMonth: smallint("financial_year_start_month")
      .notNull()
      .default(1),
    createdAt: createdAt(),
  },
  (t) => [
    check(
      "organizations_fy_start_check",
      sql`${t.financialYearStartMonth} between 1 and 12`,
    ),
  ],
);

export const memberships = pgTable(
  "memberships",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: roleEnum("role").notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.userId] }),
    index("memberships_user_idx").on(t.userId),
  ],
);

export const invitations = pgTable(
  "invitations",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    email: text("email").notNull(),
    role: roleEnum("role").notNull(),
    tokenHash: text("token_hash").notNull(),
    invitedByUserId: text("invited_by_user_id").references(() => users.id, {
      onDelete: "set null",
    }),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("invitations_token_unique").on(t.tokenHash),
  ],
);

/** Machine principals: the key itself is shown once and stored only as a hash. */
export const gateways = pgTable(
  "gateways",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    name: text("name").notNull(),
    keyHash: text("key_hash").notNull(),
    keyPrefix: text("key_prefix").notNull(),
    lastSeenAt: timestamp("last_seen_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("gateways_key_hash_unique").on(t.keyHash),
  ],
);

/**
 * Organisation API tokens for integrations and reporting tools
 * (app/auth/api-tokens.server.ts). A token acts with its role, never as a
 * person; only its SHA-256 hash is stored, the secret is shown once. Its role
 * is limited to the two a tool needs (read-only, or running the estate).
 */
export const apiTokens = pgTable(
  "api_tokens",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    name: text("name").notNull(),
    role: roleEnum("role").notNull(),
    tokenHash: text("token_hash").notNull(),
    tokenPrefix: text("token_prefix").notNull(),
    createdByUserId: text("created_by_user_id").references(() => users.id, {
      onDelete: "set null",
    }),
    createdAt: createdAt(),
    /** Null: the token never expires (the owner chose so). */
    expiresAt: timestamp("expires_at", { withTimezone: true }),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("api_tokens_token_hash_unique").on(t.tokenHash),
    check(
      "api_tokens_role_check",
      sql`${t.role} in ('auditor', 'energy_manager')`,
    ),
  ],
);

/**
 * Who changed what, when, why, and the values before and after, for every
 * change inside an organisation (the Audit trail page). Written in the same
 * transaction as the change (app/audit/record-audit.server.ts). `site_id` and
 * `meter_id` say where the change applies, for filtering; a change made by a
 * gateway (late readings) names it in `actor_gateway_id`, one made over the
 * API with an organisation token in `actor_token_id`, one made by Stripe or
 * by Joulebook itself has no actor.
 */
export const auditLog = pgTable(
  "audit_log",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: bigserial("id", { mode: "number" }).notNull(),
    actorUserId: text("actor_user_id").references(() => users.id, {
      onDelete: "set null",
    }),
    actorGatewayId: uuid("actor_gateway_id"),
    /** A change made over the API with an organisation API token. */
    actorTokenId: uuid("actor_token_id"),
    action: text("action").notNull(),
    subject: text("subject").notNull(),
    siteId: uuid("site_id"),
    meterId: uuid("meter_id"),
    reason: text("reason"),
    before: jsonb("before").$type<Record<string, unknown>>(),
    after: jsonb("after").$type<Record<string, unknown>>(),
    details: jsonb("details").$type<Record<string, unknown>>().notNull(),
    occurredAt: timestamp("occurred_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("audit_log_occurred_idx").on(t.organizationId, t.occurredAt),
  ],
);

export type Role = (typeof roleEnum.enumValues)[number];

// ---------------------------------------------------------------------------
// Sites, meters and what they measure
// ---------------------------------------------------------------------------

// The enums' values come from the app's one list of each; the order is the
// PostgreSQL type's, so a new value goes at the end (and gets a migration).
export const quantityEnum = pgEnum("meter_quantity", quantities);
export const carrierEnum = pgEnum("energy_carrier", carriers);
export const orientationEnum = pgEnum("boundary_orientation", orientations);
export const sensorPositionEnum = pgEnum("sensor_position", sensorPositions);
export const meterPositionEnum = pgEnum("meter_position", meterPositions);
export const intervalQualityEnum = pgEnum(
  "interval_quality",
  intervalQualities,
);

export const sites = pgTable(
  "sites",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    name: text("name").notNull(),
    timeZone: text("time_zone").notNull(),
    floorAreaM2: numeric("floor_area_m2", { precision: 12, scale: 2 }),
    degreeDayBaseC: numeric("degree_day_base_c", { precision: 4, scale: 1 })
      .notNull()
      .default("15.5"),
    address: text("address").notNull().default(""),
    createdAt: createdAt(),
    archivedAt: timestamp("archived_at", { withTimezone: true }),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("sites_name_unique").on(
      t.organizationId,
      sql`lower(${t.name})`,
    ),
  ],
);

export const meters = pgTable(
  "meters",
  {
    organizationId: uuid("organization_id").notNull(),
    id: uuid("id").notNull().defaultRandom(),
    siteId: uuid("site_id").notNull(),
    /** The name gateways use for the meter in readings (`meter` field). */
    code: text("code").notNull(),
    name: text("name").notNull(),
    quantity: quantityEnum("quantity").notNull(),
    carrier: carrierEnum("carrier").notNull(),
    orientation: orientationEnum("orientation").notNull(),
    parentMeterId: uuid("parent_meter_id"),
    /** On the boundary (counted as delivered or exported) or inside it. */
    position: meterPositionEnum("position").notNull().default("boundary"),
    serial: text("serial").notNull().default(""),
    multiplier: numeric("multiplier", { precision: 12, scale: 4 })
      .notNull()
      .default("1"),
    rolloverKwh: numeric("rollover_kwh", { precision: 16, scale: 3 }),
    sensorAt: sensorPositionEnum("sensor_at"),
    defaultPressureBarAbs: numeric("default_pressure_bar_abs", {
      precision: 6,
      scale: 3,
    }),
    /**
     * Minutes per interval (15, 30 or 60): its intervals start on multiples
     * of it in UTC, and one interval ends this long after it starts. Fixed
     * once the meter has intervals (app/sites/meter-resolution.server.ts).
     */
    intervalMinutes: smallint("interval_minutes")
      .notNull()
      .default(DEFAULT_INTERVAL_MINUTES),
    /** An interval above this multiple of the meter's typical value is a spike. */
    spikeFactor: numeric("spike_factor", { precision: 6, scale: 2 })
      .notNull()
      .default("10"),
    /** EN 1434 accuracy class (1, 2 or 3) of a heat meter, for its MPE band. */
    accuracyClass: integer("accuracy_class"),
    deltaThetaMinK: numeric("delta_theta_min_k", { precision: 5, scale: 2 }),
    qpM3PerH: numeric("qp_m3_per_h", { precision: 10, scale: 3 }),
    installedAt: timestamp("installed_at", { withTimezone: true }).notNull(),
    removedAt: timestamp("removed_at", { withTimezone: true }),
    replacedByMeterId: uuid("replaced_by_meter_id"),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("meters_code_unique").on(t.organizationId, t.code),
    check(
      "meters_interval_minutes_check",
      sql`${t.intervalMinutes} in (${sql.raw(intervalResolutions.join(", "))})`,
    ),
    index("meters_site_idx").on(t.organizationId, t.siteId),
    foreignKey({
      columns: [t.organizationId, t.siteId],
      foreignColumns: [sites.organizationId, sites.id],
    }).onDelete("cascade"),
    foreignKey({
      columns: [t.organizationId, t.parentMeterId],
      foreignColumns: [t.organizationId, t.id],
    }),
    foreignKey({
      columns: [t.organizationId, t.replacedByMeterId],
      foreignColumns: [t.organizationId, t.id],
    }),
  ],
);

// ---------------------------------------------------------------------------
// Readings as received, and the intervals derived from them, at each meter's
// resolution (meters.interval_minutes: an interval's end is interval_start
// plus its meter's interval_minutes).
//
// Not expressible in Drizzle, so written by hand in the migrations, and true
// of the database all the same:
//  - raw_readings and intervals are PARTITION BY RANGE on their time
//    (reading_time, interval_start), one partition per UTC month named
//    `<table>_YYYY_MM`, created on demand by the SQL function
//    ensure_month_partitions(from, to) under advisory lock 20261201
//    (drizzle/0001_sites_meters_readings.sql; app/ingest/partitions.server.ts;
//    docs/scaling.md).
//  - Every table here that names a meter_id has a foreign key
//    (organization_id, meter_id) → meters (organization_id, id) ON DELETE
//    CASCADE: raw_readings_meter_fk, intervals_meter_fk,
//    reading_conflicts_meter_fk (0001), monthly_rollups_meter_fk and
//    ledger_adjustments_meter_fk (0002). Declared here they would make
//    drizzle-kit generate them a second time.
// ---------------------------------------------------------------------------

export const ingestBatches = pgTable(
  "ingest_batches",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    source: text("source").notNull(),
    gatewayId: uuid("gateway_id"),
    userId: text("user_id"),
    /** The organisation API token that posted the batch, if one did. */
    apiTokenId: uuid("api_token_id"),
    receivedAt: timestamp("received_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
    accepted: integer("accepted").notNull(),
    repeats: integer("repeats").notNull(),
    rejected: integer("rejected").notNull(),
    conflicts: integer("conflicts").notNull(),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.id] })],
);

/**
 * Immutable: exactly what arrived, keyed by meter and time (idempotency).
 * Partitioned by month of reading_time; raw_readings_meter_fk (see above).
 */
export const rawReadings = pgTable(
  "raw_readings",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    readingTime: timestamp("reading_time", {
      withTimezone: true,
      mode: "date",
    }).notNull(),
    endTime: timestamp("end_time", { withTimezone: true, mode: "date" }),
    payload: jsonb("payload").$type<Record<string, unknown>>().notNull(),
    payloadHash: text("payload_hash").notNull(),
    /** Signed energy of an interval reading, computed once at ingest. */
    energyKwh: numeric("energy_kwh", { precision: 20, scale: 6 }),
    registerKwh: numeric("register_kwh", { precision: 20, scale: 4 }),
    /** The EN 1434 MPE of this reading's energy, as ± kWh, where it applies. */
    uncertaintyKwh: numeric("uncertainty_kwh", { precision: 20, scale: 6 }),
    batchId: uuid("batch_id").notNull(),
    receivedAt: timestamp("received_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId, t.readingTime] }),
  ],
);

/** A reading that disagreed with one already stored: kept for review. reading_conflicts_meter_fk (see above). */
export const readingConflicts = pgTable(
  "reading_conflicts",
  {
    organizationId: uuid("organization_id").notNull(),
    id: bigserial("id", { mode: "number" }).notNull(),
    meterId: uuid("meter_id").notNull(),
    readingTime: timestamp("reading_time", {
      withTimezone: true,
      mode: "date",
    }).notNull(),
    payload: jsonb("payload").$type<Record<string, unknown>>().notNull(),
    batchId: uuid("batch_id").notNull(),
    receivedAt: timestamp("received_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
    resolvedAt: timestamp("resolved_at", { withTimezone: true }),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("reading_conflicts_meter_idx").on(t.organizationId, t.meterId),
  ],
);

/** Partitioned by month of interval_start; intervals_meter_fk (see above). */
export const intervals = pgTable(
  "intervals",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    intervalStart: timestamp("interval_start", {
      withTimezone: true,
      mode: "date",
    }).notNull(),
    /** Signed by the boundary convention: into the site positive. */
    energyKwh: numeric("energy_kwh", { precision: 20, scale: 6 }).notNull(),
    /** Sum of the readings' EN 1434 bands (a bound: errors may correlate). */
    uncertaintyKwh: numeric("uncertainty_kwh", { precision: 20, scale: 6 })
      .notNull()
      .default("0"),
    quality: intervalQualityEnum("quality").notNull(),
    flags: text("flags")
      .array()
      .notNull()
      .default(sql`'{}'::text[]`),
    /** reading_time of the raw readings this hour was computed from. */
    sourceReadingTimes: timestamp("source_reading_times", {
      withTimezone: true,
      mode: "date",
    })
      .array()
      .notNull()
      .default(sql`'{}'::timestamptz[]`),
    estimateMethod: text("estimate_method"),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId, t.intervalStart] }),
    // Edited intervals are rare: this finds them in a month without reading
    // the month, so a report's data quality reads only incomplete months
    // (app/reports/data/data-quality.server.ts).
    index("intervals_edited_idx")
      .on(t.organizationId, t.meterId, t.intervalStart)
      .where(sql`quality = 'edited'`),
  ],
);

export type Quantity = (typeof quantityEnum.enumValues)[number];
export type IntervalQuality = (typeof intervalQualityEnum.enumValues)[number];

// ---------------------------------------------------------------------------
// The monthly ledger: rollups kept up to date as intervals change, month
// closes, and the adjusting entries recorded when a closed month changes.
// ---------------------------------------------------------------------------

/**
 * One meter's signed energy in one month of its site's local calendar.
 * monthly_rollups_meter_fk → meters, by hand in 0002 (see "Readings" above).
 */
export const monthlyRollups = pgTable(
  "monthly_rollups",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    /** The first day of the site-local month. */
    month: date("month", { mode: "string" }).notNull(),
    energyKwh: numeric("energy_kwh", { precision: 24, scale: 6 }).notNull(),
    uncertaintyKwh: numeric("uncertainty_kwh", { precision: 24, scale: 6 })
      .notNull()
      .default("0"),
    estimatedKwh: numeric("estimated_kwh", {
      precision: 24,
      scale: 6,
    }).notNull(),
    /**
     * Intervals stored in the month, and how many are estimated: hours for
     * an hourly meter, half-hours for a half-hourly one (the names predate
     * meters' resolution; the energies are sums and exact at any).
     */
    hours: integer("hours").notNull(),
    estimatedHours: integer("estimated_hours").notNull(),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId, t.month] }),
    // The ledger, Overview and reports read an organisation's months.
    index("monthly_rollups_month_idx").on(t.organizationId, t.month),
  ],
);

/** A closed month, for one site or (site_id null) the whole organisation. */
export const monthCloses = pgTable(
  "month_closes",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    siteId: uuid("site_id"),
    month: date("month", { mode: "string" }).notNull(),
    closedByUserId: text("closed_by_user_id").references(() => users.id, {
      onDelete: "set null",
    }),
    closedAt: timestamp("closed_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
    reopenedAt: timestamp("reopened_at", { withTimezone: true }),
    reopenedByUserId: text("reopened_by_user_id").references(() => users.id, {
      onDelete: "set null",
    }),
    reopenReason: text("reopen_reason"),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("month_closes_active_unique")
      .on(
        t.organizationId,
        sql`coalesce(${t.siteId}, '00000000-0000-0000-0000-000000000000'::uuid)`,
        t.month,
      )
      .where(sql`${t.reopenedAt} is null`),
  ],
);

/**
 * A change to a closed month: never a silent edit.
 * ledger_adjustments_meter_fk → meters, by hand in 0002 (see "Readings" above).
 */
export const ledgerAdjustments = pgTable(
  "ledger_adjustments",
  {
    organizationId: uuid("organization_id").notNull(),
    id: bigserial("id", { mode: "number" }).notNull(),
    meterId: uuid("meter_id").notNull(),
    month: date("month", { mode: "string" }).notNull(),
    deltaKwh: numeric("delta_kwh", { precision: 24, scale: 6 }).notNull(),
    /** late_data, edit or estimate */
    source: text("source").notNull(),
    reason: text("reason").notNull(),
    actorUserId: text("actor_user_id"),
    gatewayId: uuid("gateway_id"),
    createdAt: timestamp("created_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("ledger_adjustments_month_idx").on(t.organizationId, t.month),
  ],
);

// ---------------------------------------------------------------------------
// Weather and baselines: daily mean outdoor temperature per site, and the
// weather-normalised energy baselines fitted on it.
// ---------------------------------------------------------------------------

/** One site-local calendar day's mean outdoor temperature. */
export const dailyWeather = pgTable(
  "daily_weather",
  {
    organizationId: uuid("organization_id").notNull(),
    siteId: uuid("site_id").notNull(),
    day: date("day", { mode: "string" }).notNull(),
    meanTempC: numeric("mean_temp_c", { precision: 5, scale: 2 }).notNull(),
    /** upload or seed */
    source: text("source").notNull(),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.siteId, t.day] }),
    foreignKey({
      columns: [t.organizationId, t.siteId],
      foreignColumns: [sites.organizationId, sites.id],
    }).onDelete("cascade"),
    check("daily_weather_source_check", sql`${t.source} in ('upload', 'seed')`),
  ],
);

/** A saved energy baseline: the model, its fit statistics and its data. */
export const baselines = pgTable(
  "baselines",
  {
    organizationId: uuid("organization_id").notNull(),
    id: uuid("id").notNull().defaultRandom(),
    siteId: uuid("site_id").notNull(),
    carrier: carrierEnum("carrier").notNull(),
    /** First and last day of the baseline period, inclusive. */
    periodFrom: date("period_from", { mode: "string" }).notNull(),
    periodTo: date("period_to", { mode: "string" }).notNull(),
    /** monthly or daily */
    granularity: text("granularity").notNull(),
    /** slope, intercept, n, r2, cvrmse, nmbe, the driver and the points fitted. */
    model: jsonb("model").$type<Record<string, unknown>>().notNull(),
    createdByUserId: text("created_by_user_id").references(() => users.id, {
      onDelete: "set null",
    }),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("baselines_site_idx").on(t.organizationId, t.siteId, t.carrier),
    foreignKey({
      columns: [t.organizationId, t.siteId],
      foreignColumns: [sites.organizationId, sites.id],
    }).onDelete("cascade"),
    check(
      "baselines_granularity_check",
      sql`${t.granularity} in ('monthly', 'daily')`,
    ),
    check("baselines_period_check", sql`${t.periodFrom} <= ${t.periodTo}`),
  ],
);

// ---------------------------------------------------------------------------
// Plant inside a site's boundary (boiler, CHP, heat pump, chiller, fuel
// cell): a sub-system with the meters on its inputs and outputs, judged each
// month against the first and second laws (app/plant/).
// ---------------------------------------------------------------------------

export const plantKindEnum = pgEnum("plant_kind", plantKinds);
export const plantMeterRoleEnum = pgEnum("plant_meter_role", plantMeterRoles);

export const plants = pgTable(
  "plants",
  {
    organizationId: uuid("organization_id").notNull(),
    id: uuid("id").notNull().defaultRandom(),
    siteId: uuid("site_id").notNull(),
    kind: plantKindEnum("kind").notNull(),
    name: text("name").notNull(),
    /** The calorific-value basis its fuel meters' kWh are stated on. */
    fuelCvBasis: text("fuel_cv_basis").notNull().default("gross"),
    /** Design water temperatures: the Carnot and exergy figures use them. */
    heatFlowC: numeric("heat_flow_c", { precision: 5, scale: 1 }),
    heatReturnC: numeric("heat_return_c", { precision: 5, scale: 1 }),
    chilledFlowC: numeric("chilled_flow_c", { precision: 5, scale: 1 }),
    chilledReturnC: numeric("chilled_return_c", { precision: 5, scale: 1 }),
    createdAt: createdAt(),
    archivedAt: timestamp("archived_at", { withTimezone: true }),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("plants_name_unique").on(
      t.organizationId,
      t.siteId,
      sql`lower(${t.name})`,
    ),
    foreignKey({
      columns: [t.organizationId, t.siteId],
      foreignColumns: [sites.organizationId, sites.id],
    }).onDelete("cascade"),
    check(
      "plants_fuel_cv_basis_check",
      sql`${t.fuelCvBasis} in ('gross', 'net')`,
    ),
  ],
);

/** Which meter measures which of a plant's inputs or outputs. */
export const plantMeters = pgTable(
  "plant_meters",
  {
    organizationId: uuid("organization_id").notNull(),
    plantId: uuid("plant_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    role: plantMeterRoleEnum("role").notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.plantId, t.meterId] }),
    foreignKey({
      columns: [t.organizationId, t.plantId],
      foreignColumns: [plants.organizationId, plants.id],
    }).onDelete("cascade"),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
    }).onDelete("cascade"),
  ],
);

// ---------------------------------------------------------------------------
// Alerts: what each person wants by e-mail, and which conditions are open
// (one open alert per condition, so a condition is mailed once until it clears).
// ---------------------------------------------------------------------------

export const alertSettings = pgTable(
  "alert_settings",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    silentMeter: boolean("silent_meter").notNull(),
    residual: boolean("residual").notNull(),
    monthReady: boolean("month_ready").notNull(),
    /** A plant's month broke a law: a meter on it reads wrongly. */
    plantFault: boolean("plant_fault").notNull().default(true),
    silentHours: integer("silent_hours").notNull().default(NO_DATA_AFTER_HOURS),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.userId] })],
);

export const alertEvents = pgTable(
  "alert_events",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: bigserial("id", { mode: "number" }).notNull(),
    kind: text("kind").notNull(),
    subject: text("subject").notNull(),
    title: text("title").notNull(),
    openedAt: timestamp("opened_at", { withTimezone: true }).notNull(),
    clearedAt: timestamp("cleared_at", { withTimezone: true }),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("alert_events_open_unique")
      .on(t.organizationId, t.kind, t.subject)
      .where(sql`${t.clearedAt} is null`),
  ],
);

// ---------------------------------------------------------------------------
// Billing: one Stripe customer and subscription per organisation, the invoices
// seen through webhooks, and every webhook event applied (once) by its id.
// ---------------------------------------------------------------------------

export const billingAccounts = pgTable(
  "billing_accounts",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" })
      .primaryKey(),
    stripeCustomerId: text("stripe_customer_id").notNull(),
    stripeSubscriptionId: text("stripe_subscription_id"),
    /** none, trialing, active, past_due, canceled, incomplete, unpaid */
    status: text("status").notNull().default("none"),
    /** The subscription quantity last confirmed by Stripe. */
    quantity: integer("quantity").notNull().default(0),
    trialEndsAt: timestamp("trial_ends_at", { withTimezone: true }),
    currentPeriodEnd: timestamp("current_period_end", { withTimezone: true }),
    cancelAtPeriodEnd: boolean("cancel_at_period_end").notNull().default(false),
    /** When the subscription first went past due; cleared when paid. */
    pastDueSince: timestamp("past_due_since", { withTimezone: true }),
    lastReconciledAt: timestamp("last_reconciled_at", { withTimezone: true }),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    // Not unique: a sharded store can only enforce keys that hold organization_id.
    index("billing_accounts_customer_idx").on(t.stripeCustomerId),
    // Stripe's subscription statuses, and none before the first subscription.
    check(
      "billing_accounts_status_check",
      sql`${t.status} in ('none', 'trialing', 'active', 'past_due', 'canceled', 'incomplete', 'incomplete_expired', 'unpaid', 'paused')`,
    ),
  ],
);

export const billingInvoices = pgTable(
  "billing_invoices",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    stripeInvoiceId: text("stripe_invoice_id").notNull(),
    number: text("number"),
    /** draft, open, paid, uncollectible, void */
    status: text("status").notNull(),
    currency: text("currency").notNull(),
    /** Minor units (cents), as Stripe sends them. */
    amountDue: integer("amount_due").notNull(),
    amountPaid: integer("amount_paid").notNull(),
    periodStart: timestamp("period_start", { withTimezone: true }),
    periodEnd: timestamp("period_end", { withTimezone: true }),
    hostedInvoiceUrl: text("hosted_invoice_url"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.stripeInvoiceId] }),
    check(
      "billing_invoices_status_check",
      sql`${t.status} in ('draft', 'open', 'paid', 'uncollectible', 'void')`,
    ),
  ],
);

/**
 * Webhook events already applied. Not a tenant table: an event is keyed by
 * Stripe's id alone (it may name a customer we do not know).
 */
export const billingEvents = pgTable("billing_events", {
  eventId: text("event_id").primaryKey(),
  type: text("type").notNull(),
  organizationId: uuid("organization_id"),
  receivedAt: timestamp("received_at", { withTimezone: true })
    .notNull()
    .defaultNow(),
});

// ---------------------------------------------------------------------------
// Signed reports: generated in the background, stored with their bytes and
// SHA-256 so an uploaded copy can be matched to the report it claims to be.
// ---------------------------------------------------------------------------

const bytea = customType<{ data: Buffer; driverData: Buffer }>({
  dataType: () => "bytea",
});

export const reports = pgTable(
  "reports",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    /** Null for an organisation-wide report. */
    siteId: uuid("site_id"),
    /** month, quarter or year */
    periodKind: text("period_kind").notNull(),
    /** First day of the period and first day after it (site-local months). */
    periodStart: date("period_start", { mode: "string" }).notNull(),
    periodEnd: date("period_end", { mode: "string" }).notNull(),
    title: text("title").notNull(),
    /** queued, running, done, failed */
    status: text("status").notNull().default("queued"),
    progress: integer("progress").notNull().default(0),
    progressNote: text("progress_note").notNull().default(""),
    error: text("error"),
    /** True when every month in the period was closed at generation time. */
    allMonthsClosed: boolean("all_months_closed"),
    pdf: bytea("pdf"),
    sha256: text("sha256"),
    byteSize: integer("byte_size"),
    pageCount: integer("page_count"),
    createdByUserId: text("created_by_user_id").references(() => users.id, {
      onDelete: "set null",
    }),
    createdAt: createdAt(),
    completedAt: timestamp("completed_at", { withTimezone: true }),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("reports_sha256_idx").on(t.organizationId, t.sha256),
    index("reports_created_idx").on(t.organizationId, t.createdAt),
    // The queue's start-up sweep for requests that never became a job.
    index("reports_pickup_idx")
      .on(t.status)
      .where(sql`${t.status} in ('queued', 'running')`),
    check(
      "reports_status_check",
      sql`${t.status} in ('queued', 'running', 'done', 'failed')`,
    ),
    check(
      "reports_period_kind_check",
      sql`${t.periodKind} in ('month', 'quarter', 'year', 'financial_year', 'financial_quarter')`,
    ),
  ],
);

// ---------------------------------------------------------------------------
// Carbon: emission-factor sets per calendar year and carrier (location-based,
// with the set's market-based residual factor), supply contracts that give a
// meter its own market-based factor, and the adjusting entries a change to
// either makes to closed months (docs/carbon.md).
// ---------------------------------------------------------------------------

/** One year's factors for one carrier, with where they come from. */
export const emissionFactorSets = pgTable(
  "emission_factor_sets",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    year: smallint("year").notNull(),
    carrier: carrierEnum("carrier").notNull(),
    /** 1 for fuels burnt on site, 2 for bought electricity, heat, steam, cooling. */
    scope: smallint("scope").notNull(),
    locationKgPerKwh: numeric("location_kg_per_kwh", {
      precision: 14,
      scale: 8,
    }).notNull(),
    /** The residual mix for supplies without a contract; null: the location factor. */
    marketKgPerKwh: numeric("market_kg_per_kwh", { precision: 14, scale: 8 }),
    /** Transmission and distribution losses plus well-to-tank, reported apart. */
    scope3KgPerKwh: numeric("scope3_kg_per_kwh", { precision: 14, scale: 8 }),
    source: text("source").notNull(),
    version: text("version").notNull(),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("emission_factor_sets_year_carrier_unique").on(
      t.organizationId,
      t.year,
      t.carrier,
    ),
    check("emission_factor_sets_scope_check", sql`${t.scope} in (1, 2)`),
    check(
      "emission_factor_sets_source_check",
      sql`length(btrim(${t.source})) > 0`,
    ),
    check(
      "emission_factor_sets_factors_check",
      sql`${t.locationKgPerKwh} >= 0 and coalesce(${t.marketKgPerKwh}, 0) >= 0 and coalesce(${t.scope3KgPerKwh}, 0) >= 0`,
    ),
  ],
);

/**
 * A supplier-specific or zero-carbon contract for one supply (a boundary
 * meter): its market-based factor for the months it covers.
 */
export const emissionContracts = pgTable(
  "emission_contracts",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    meterId: uuid("meter_id").notNull(),
    name: text("name").notNull(),
    kgPerKwh: numeric("kg_per_kwh", { precision: 14, scale: 8 }).notNull(),
    /** First and last month covered (first days); no end: open. */
    validFrom: date("valid_from", { mode: "string" }).notNull(),
    validTo: date("valid_to", { mode: "string" }),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
      name: "emission_contracts_meter_fk",
    }).onDelete("cascade"),
    check("emission_contracts_factor_check", sql`${t.kgPerKwh} >= 0`),
  ],
);

/**
 * What a factor or contract change did to a closed month's carbon: the
 * month keeps its closed figure and the difference is shown beside it.
 * Unbounded numeric: kWh × kg/kWh is kept to the last digit.
 */
export const carbonAdjustments = pgTable(
  "carbon_adjustments",
  {
    organizationId: uuid("organization_id").notNull(),
    id: bigserial("id", { mode: "number" }).notNull(),
    meterId: uuid("meter_id").notNull(),
    month: date("month", { mode: "string" }).notNull(),
    deltaCo2eKg: numeric("delta_co2e_kg").notNull(),
    deltaCo2eMarketKg: numeric("delta_co2e_market_kg").notNull(),
    reason: text("reason").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("carbon_adjustments_month_idx").on(t.organizationId, t.month),
  ],
);

// ---------------------------------------------------------------------------
// Budgets and targets: a budget per site, carrier and financial year (kWh and
// money), spread by month; one carbon target per organisation.
// ---------------------------------------------------------------------------

export const budgets = pgTable(
  "budgets",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    siteId: uuid("site_id").notNull(),
    carrier: carrierEnum("carrier").notNull(),
    /** The calendar year the financial year starts in (FY 2025 starts in 2025). */
    financialYear: smallint("financial_year").notNull(),
    energyKwh: numeric("energy_kwh", { precision: 24, scale: 6 }).notNull(),
    /** Money, in the organisation's currency; null: no money budget. */
    amount: numeric("amount", { precision: 18, scale: 2 }),
    currency: text("currency"),
    /** flat or degree_days */
    spread: text("spread").notNull().default("flat"),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("budgets_site_carrier_year_unique").on(
      t.organizationId,
      t.siteId,
      t.carrier,
      t.financialYear,
    ),
    foreignKey({
      columns: [t.organizationId, t.siteId],
      foreignColumns: [sites.organizationId, sites.id],
      name: "budgets_site_fk",
    }).onDelete("cascade"),
    check("budgets_spread_check", sql`${t.spread} in ('flat', 'degree_days')`),
    check(
      "budgets_amounts_check",
      sql`${t.energyKwh} >= 0 and coalesce(${t.amount}, 0) >= 0`,
    ),
  ],
);

/** A carbon target: a share below a base financial year, by a target year. */
export const carbonTargets = pgTable(
  "carbon_targets",
  {
    organizationId: uuid("organization_id")
      .notNull()
      .references(() => organizations.id, { onDelete: "cascade" }),
    id: uuid("id").notNull().defaultRandom(),
    baseYear: smallint("base_year").notNull(),
    targetYear: smallint("target_year").notNull(),
    reductionPercent: numeric("reduction_percent", {
      precision: 5,
      scale: 2,
    }).notNull(),
    /** location or market */
    basis: text("basis").notNull().default("location"),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    uniqueIndex("carbon_targets_org_unique").on(t.organizationId),
    check(
      "carbon_targets_check",
      sql`${t.targetYear} > ${t.baseYear} and ${t.reductionPercent} > 0 and ${t.reductionPercent} <= 100 and ${t.basis} in ('location', 'market')`,
    ),
  ],
);

// ---------------------------------------------------------------------------
// Oil and LPG tanks (app/tanks/, docs/fuels-tanks.md): a liquid-fuel meter
// becomes a tank with its settings; its dips (stock, a state) and deliveries
// (a path) give the consumption between consecutive dips, which is spread
// over the meter's intervals.
// ---------------------------------------------------------------------------

/** A liquid-fuel meter that is a tank: its capacity and declared fuel. */
export const tanks = pgTable(
  "tanks",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    capacityL: numeric("capacity_l", { precision: 12, scale: 3 }).notNull(),
    /** Used where no delivery note states the fuel's own figures. */
    densityKgL: numeric("density_kg_l", { precision: 6, scale: 4 }).notNull(),
    calorificValueMjKg: numeric("calorific_value_mj_kg", {
      precision: 6,
      scale: 3,
    }).notNull(),
    cvBasis: text("cv_basis").notNull().default("gross"),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId] }),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
    }).onDelete("cascade"),
    check("tanks_cv_basis_check", sql`${t.cvBasis} in ('gross', 'net')`),
  ],
);

/** A stock reading (a dip): the litres in the tank at an instant. */
export const tankDips = pgTable(
  "tank_dips",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    dippedAt: timestamp("dipped_at", { withTimezone: true }).notNull(),
    stockL: numeric("stock_l", { precision: 12, scale: 3 }).notNull(),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId, t.dippedAt] }),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [tanks.organizationId, tanks.meterId],
    }).onDelete("cascade"),
  ],
);

/** A delivery into the tank, with what its delivery note states. */
export const tankDeliveries = pgTable(
  "tank_deliveries",
  {
    organizationId: uuid("organization_id").notNull(),
    id: uuid("id").notNull().defaultRandom(),
    meterId: uuid("meter_id").notNull(),
    deliveredAt: timestamp("delivered_at", { withTimezone: true }).notNull(),
    volumeL: numeric("volume_l", { precision: 12, scale: 3 }).notNull(),
    densityKgL: numeric("density_kg_l", { precision: 6, scale: 4 }),
    calorificValueMjKg: numeric("calorific_value_mj_kg", {
      precision: 6,
      scale: 3,
    }),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("tank_deliveries_meter_idx").on(
      t.organizationId,
      t.meterId,
      t.deliveredAt,
    ),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [tanks.organizationId, tanks.meterId],
    }).onDelete("cascade"),
  ],
);

// ---------------------------------------------------------------------------
// Exergy beside energy (app/exergy/): what each heat or cooling interval
// measured with flow and return temperatures needs for its exergy at any
// dead state, and each meter's month of it at the site's daily outdoor means.
// ---------------------------------------------------------------------------

/**
 * The weather-independent part of an interval's exergy, from the readings
 * with temperatures that made it: Ex = heat − T₀·entropy (T₀ in K, the day's
 * outdoor mean), both signed into the site. Kept apart from `intervals` so
 * that exergy can be recomputed when a day's weather arrives later.
 * Range-partitioned by month on interval_start like `intervals`, by hand in
 * 0024 (Drizzle cannot declare it).
 */
export const intervalExergy = pgTable(
  "interval_exergy",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    intervalStart: timestamp("interval_start", {
      withTimezone: true,
      mode: "date",
    }).notNull(),
    /** m·(h_flow − h_return), kWh, signed into the site. */
    heatKwh: numeric("heat_kwh", { precision: 24, scale: 9 }).notNull(),
    /** m·(s_flow − s_return), kWh/K, signed like the heat. */
    entropyKwhPerK: numeric("entropy_kwh_per_k", {
      precision: 24,
      scale: 12,
    }).notNull(),
    /**
     * The flow temperature the dead state must stay on the useful side of
     * (below it for heating, above it for chilled water): the lowest heating
     * flow, or the highest chilled flow, of the interval's readings; null
     * when they disagree on the direction, so no exergy is given.
     */
    flowLimitC: numeric("flow_limit_c", { precision: 7, scale: 3 }),
    /** Flow warmer than return (heating), else chilled water. */
    heating: boolean("heating").notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId, t.intervalStart] }),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
    }).onDelete("cascade"),
  ],
);

/**
 * One meter's exergy in one site-local month: the sum over its measured
 * intervals whose day has an outdoor mean, and how many intervals that was
 * (the rollup's `hours` says how many there are).
 */
export const monthlyExergy = pgTable(
  "monthly_exergy",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    /** The first day of the site-local month. */
    month: date("month", { mode: "string" }).notNull(),
    /** The exact sum rounded to the micro-kWh the ledger shows. */
    exergyKwh: numeric("exergy_kwh", { precision: 24, scale: 6 })
      .notNull()
      .default("0"),
    /**
     * The exact sum (scale 14: heat to 1e-9 less T₀ to 1e-2 times entropy
     * to 1e-12), which ingest moves by exact differences; rounding each
     * difference to 6 places would drift from a recompute.
     */
    exergyExactKwh: numeric("exergy_exact_kwh").notNull().default("0"),
    intervals: integer("intervals").notNull().default(0),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId, t.month] }),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
    }).onDelete("cascade"),
  ],
);

// ---------------------------------------------------------------------------
// Gas supplies (issue #15): the calorific values of each natural-gas meter's
// supply, the meter's register and volume-correction settings, and the
// volume behind each interval whose energy took its CV from the series, so a
// CV entered or changed later recomputes exactly those intervals (app/gas/).
// ---------------------------------------------------------------------------

/**
 * One calorific value of a gas supply, for a site-local month or a single
 * day (a day's value beats its month's). `period_start` is the month's
 * first day or the day itself.
 */
export const calorificValues = pgTable(
  "calorific_values",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    periodKind: text("period_kind").notNull(),
    periodStart: date("period_start", { mode: "string" }).notNull(),
    calorificValueMjM3: numeric("calorific_value_mj_m3", {
      precision: 7,
      scale: 4,
    }).notNull(),
    basis: text("basis").notNull(),
    source: text("source").notNull().default(""),
    enteredByUserId: text("entered_by_user_id").references(() => users.id, {
      onDelete: "set null",
    }),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({
      columns: [t.organizationId, t.meterId, t.periodKind, t.periodStart],
    }),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
    }).onDelete("cascade"),
    check(
      "calorific_values_period_kind_check",
      sql`${t.periodKind} in ('month', 'day')`,
    ),
    check(
      "calorific_values_month_start_check",
      sql`${t.periodKind} = 'day' or extract(day from ${t.periodStart}) = 1`,
    ),
    check("calorific_values_basis_check", sql`${t.basis} in ('gross', 'net')`),
    check(
      "calorific_values_range_check",
      sql`${t.calorificValueMjM3} between 10 and 60`,
    ),
  ],
);

/**
 * A natural-gas meter's register and volume correction. A register unit
 * makes the meter a register meter (cumulative m³ or hundreds of cubic feet,
 * with the meter's multiplier and roll-over point in the register's unit);
 * the correction brings metered volumes to 15 °C and 1013.25 mbar: a stated
 * factor, or the gas temperature and gauge pressure, or neither.
 */
export const gasMeterSettings = pgTable(
  "gas_meter_settings",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    registerUnit: text("register_unit"),
    correctionFactor: numeric("correction_factor", { precision: 8, scale: 6 }),
    gasTempC: numeric("gas_temp_c", { precision: 5, scale: 2 }),
    gasPressureMbarG: numeric("gas_pressure_mbar_g", {
      precision: 7,
      scale: 2,
    }),
    atmosphericPressureMbar: numeric("atmospheric_pressure_mbar", {
      precision: 6,
      scale: 2,
    }),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId] }),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
    }).onDelete("cascade"),
    check(
      "gas_meter_settings_unit_check",
      sql`${t.registerUnit} is null or ${t.registerUnit} in ('m3', 'hcf')`,
    ),
  ],
);

/**
 * The part of an interval's energy that took its CV from the supply's
 * series: the volume at reference conditions, the CV used (null: none was
 * in effect yet, the energy is pending) and the kWh it gave. The interval's
 * energy is recomputed from these when a CV of its day changes.
 * Range-partitioned by month on interval_start like `intervals`, by hand in
 * 0024 (Drizzle cannot declare it).
 */
export const gasIntervalVolumes = pgTable(
  "gas_interval_volumes",
  {
    organizationId: uuid("organization_id").notNull(),
    meterId: uuid("meter_id").notNull(),
    intervalStart: timestamp("interval_start", {
      withTimezone: true,
      mode: "date",
    }).notNull(),
    volumeM3: numeric("volume_m3", { precision: 24, scale: 9 }).notNull(),
    calorificValueMjM3: numeric("calorific_value_mj_m3", {
      precision: 7,
      scale: 4,
    }),
    energyKwh: numeric("energy_kwh", { precision: 20, scale: 6 }).notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.meterId, t.intervalStart] }),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
    }).onDelete("cascade"),
  ],
);

// ---------------------------------------------------------------------------
// Many server processes (app/jobs, app/api/rate-limit-store.server.ts): state
// that must hold across processes and machines is kept here, not in memory.
// ---------------------------------------------------------------------------

/**
 * Which process is running which queue job (pg-boss keeps the job itself in
 * its own `pgboss` schema). When a server process dies, its primary fails the
 * jobs recorded under its pid, so the queue retries them at once elsewhere
 * instead of waiting for their expiry.
 */
export const jobClaims = pgTable(
  "job_claims",
  {
    jobId: uuid("job_id").primaryKey(),
    queue: text("queue").notNull(),
    data: jsonb("data").notNull(),
    host: text("host").notNull(),
    pid: integer("pid").notNull(),
    startedAt: timestamp("started_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [index("job_claims_process_idx").on(t.host, t.pid)],
);

/**
 * express-rate-limit's counters (fixed windows), one row per key, so every
 * process behind the load balancer counts a gateway's batches together.
 */
export const rateLimitHits = pgTable("rate_limit_hits", {
  key: text("key").primaryKey(),
  hits: integer("hits").notNull(),
  resetsAt: timestamp("resets_at", { withTimezone: true }).notNull(),
});

// ---------------------------------------------------------------------------
// Cost: tariffs per supply, their versions, the cost of each supply's month
// computed from its intervals, and the adjusting entries written when a
// closed month's cost changes (app/tariffs, docs/costs.md).
// ---------------------------------------------------------------------------

/**
 * A supply's tariff: one meter (`meter_id`), or every boundary meter of a
 * site and carrier that has no tariff of its own (`meter_id` null).
 */
export const tariffs = pgTable(
  "tariffs",
  {
    organizationId: uuid("organization_id").notNull(),
    id: uuid("id").notNull().defaultRandom(),
    name: text("name").notNull(),
    siteId: uuid("site_id").notNull(),
    carrier: carrierEnum("carrier").notNull(),
    meterId: uuid("meter_id"),
    /** ISO 4217, e.g. GBP. */
    currency: text("currency").notNull(),
    /** Demo tariffs are invented and say so. */
    illustrative: boolean("illustrative").notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    // One tariff per supply: per meter, or per site and carrier.
    uniqueIndex("tariffs_meter_unique")
      .on(t.organizationId, t.meterId)
      .where(sql`${t.meterId} is not null`),
    uniqueIndex("tariffs_site_carrier_unique")
      .on(t.organizationId, t.siteId, t.carrier)
      .where(sql`${t.meterId} is null`),
    foreignKey({
      columns: [t.organizationId, t.siteId],
      foreignColumns: [sites.organizationId, sites.id],
    }).onDelete("cascade"),
    foreignKey({
      columns: [t.organizationId, t.meterId],
      foreignColumns: [meters.organizationId, meters.id],
    }).onDelete("cascade"),
  ],
);

/**
 * One version of a tariff's rates, valid from `valid_from` to `valid_to`
 * (both site-local days, inclusive; null: until further notice). The rates
 * are decimal text in JSON, checked by app/tariffs/tariff-schema.ts.
 */
export const tariffVersions = pgTable(
  "tariff_versions",
  {
    organizationId: uuid("organization_id").notNull(),
    id: uuid("id").notNull().defaultRandom(),
    tariffId: uuid("tariff_id").notNull(),
    validFrom: date("valid_from", { mode: "string" }).notNull(),
    validTo: date("valid_to", { mode: "string" }),
    rates: jsonb("rates").notNull(),
    createdByUserId: text("created_by_user_id"),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("tariff_versions_tariff_idx").on(
      t.organizationId,
      t.tariffId,
      t.validFrom,
    ),
    foreignKey({
      columns: [t.organizationId, t.tariffId],
      foreignColumns: [tariffs.organizationId, tariffs.id],
    }).onDelete("cascade"),
  ],
);

/** A supply's cost in one site-local month, the exact sum of its intervals' costs and its daily charges. */
export const monthlyCosts = pgTable(
  "monthly_costs",
  {
    organizationId: uuid("organization_id").notNull(),
    tariffId: uuid("tariff_id").notNull(),
    month: date("month", { mode: "string" }).notNull(),
    cost: numeric("cost").notNull(),
    currency: text("currency").notNull(),
    /** The parts of the cost (energy by band, standing, demand, VAT …), decimal text. */
    parts: jsonb("parts").notNull(),
    computedAt: timestamp("computed_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
    /**
     * The newest `updated_at` of the supply's rollups the computation saw: a
     * rollup newer than this (even one committed by a transaction that began
     * earlier) makes the month due again.
     */
    rollupsUpdatedAt: timestamp("rollups_updated_at", { withTimezone: true }),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.tariffId, t.month] }),
    foreignKey({
      columns: [t.organizationId, t.tariffId],
      foreignColumns: [tariffs.organizationId, tariffs.id],
    }).onDelete("cascade"),
  ],
);

/** A change to a closed month's cost (a tariff changed, or late energy): never silent. */
export const costAdjustments = pgTable(
  "cost_adjustments",
  {
    organizationId: uuid("organization_id").notNull(),
    id: bigserial("id", { mode: "number" }).notNull(),
    tariffId: uuid("tariff_id").notNull(),
    month: date("month", { mode: "string" }).notNull(),
    deltaCost: numeric("delta_cost").notNull(),
    currency: text("currency").notNull(),
    /** tariff or energy */
    source: text("source").notNull(),
    reason: text("reason").notNull(),
    actorUserId: text("actor_user_id"),
    createdAt: timestamp("created_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("cost_adjustments_month_idx").on(t.organizationId, t.month),
    foreignKey({
      columns: [t.organizationId, t.tariffId],
      foreignColumns: [tariffs.organizationId, tariffs.id],
    }).onDelete("cascade"),
  ],
);

// ---------------------------------------------------------------------------
// Supplier-bill checks: a supplier's bills set against the metered kWh and
// the computed cost of the same supply and months, their states and history,
// and each organisation's tolerance (app/supplier-bills, docs/costs.md).
// ---------------------------------------------------------------------------

/** A supplier's bill for one supply (a tariff) and whole site-local months. */
export const supplierBills = pgTable(
  "supplier_bills",
  {
    organizationId: uuid("organization_id").notNull(),
    id: uuid("id").notNull().defaultRandom(),
    tariffId: uuid("tariff_id").notNull(),
    /** The supply as the file named it (a meter code or the tariff's name). */
    supplyLabel: text("supply_label").notNull(),
    /** The first day of the first month and the last day of the last month. */
    periodFrom: date("period_from", { mode: "string" }).notNull(),
    periodTo: date("period_to", { mode: "string" }).notNull(),
    kwh: numeric("kwh").notNull(),
    /** What the supplier asks, VAT included. */
    amount: numeric("amount").notNull(),
    currency: text("currency").notNull(),
    readType: text("read_type").notNull(),
    /** What the check found when the bill was uploaded. */
    meteredKwh: numeric("metered_kwh").notNull(),
    computedCost: numeric("computed_cost").notNull(),
    state: text("state").notNull(),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    // One bill per supply and period: the same file twice adds nothing.
    uniqueIndex("supplier_bills_period_unique").on(
      t.organizationId,
      t.tariffId,
      t.periodFrom,
      t.periodTo,
    ),
    check(
      "supplier_bills_state_check",
      sql`${t.state} in ('agreed', 'queried', 'resolved')`,
    ),
    check(
      "supplier_bills_read_type_check",
      sql`${t.readType} in ('actual', 'estimated')`,
    ),
    check("supplier_bills_period_check", sql`${t.periodFrom} <= ${t.periodTo}`),
    foreignKey({
      columns: [t.organizationId, t.tariffId],
      foreignColumns: [tariffs.organizationId, tariffs.id],
    }).onDelete("cascade"),
  ],
);

/** Each state a bill has been given, by whom, when and why. */
export const supplierBillEvents = pgTable(
  "supplier_bill_events",
  {
    organizationId: uuid("organization_id").notNull(),
    id: bigserial("id", { mode: "number" }).notNull(),
    billId: uuid("bill_id").notNull(),
    /** Null for the state the check gave the bill on upload. */
    fromState: text("from_state"),
    toState: text("to_state").notNull(),
    note: text("note").notNull().default(""),
    actorUserId: text("actor_user_id"),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("supplier_bill_events_bill_idx").on(t.organizationId, t.billId),
    foreignKey({
      columns: [t.organizationId, t.billId],
      foreignColumns: [supplierBills.organizationId, supplierBills.id],
    }).onDelete("cascade"),
  ],
);

/**
 * How far a bill may differ from the meters and the tariff before it is
 * queried: the larger of the percentage and the absolute figure (either may
 * be absent). No row: 2 % (app/supplier-bills/bill-check.ts).
 */
export const billTolerances = pgTable(
  "bill_tolerances",
  {
    organizationId: uuid("organization_id").notNull(),
    percent: numeric("percent"),
    absoluteKwh: numeric("absolute_kwh"),
    absoluteAmount: numeric("absolute_amount"),
    updatedAt: timestamp("updated_at", { withTimezone: true })
      .notNull()
      .defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId] }),
    foreignKey({
      columns: [t.organizationId],
      foreignColumns: [organizations.id],
    }).onDelete("cascade"),
  ],
);
