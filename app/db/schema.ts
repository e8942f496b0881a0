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

export const organizations = pgTable("organizations", {
  id: uuid("id").primaryKey().defaultRandom(),
  name: text("name").notNull(),
  createdAt: createdAt(),
});

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
    /** Touched while a job runs; a stale one means its process died. */
    heartbeatAt: timestamp("heartbeat_at", { withTimezone: true }),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.id] }),
    index("reports_sha256_idx").on(t.organizationId, t.sha256),
    index("reports_created_idx").on(t.organizationId, t.createdAt),
    // Job pickup at start and every minute: only unfinished reports.
    index("reports_pickup_idx")
      .on(t.status, t.heartbeatAt)
      .where(sql`${t.status} in ('queued', 'running')`),
    check(
      "reports_status_check",
      sql`${t.status} in ('queued', 'running', 'done', 'failed')`,
    ),
    check(
      "reports_period_kind_check",
      sql`${t.periodKind} in ('month', 'quarter', 'year')`,
    ),
  ],
);

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
