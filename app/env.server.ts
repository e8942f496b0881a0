import { availableParallelism } from "node:os";
import { z } from "zod";

const WEB_CONCURRENCY_RULE =
  "WEB_CONCURRENCY must be a whole number from 1 to 64, or auto";

/**
 * The environment, validated once at boot. Each bad value is reported with its
 * name and what was expected, and the process stops before it listens.
 */
const envSchema = z
  .object({
    NODE_ENV: z
      .enum(["development", "production", "test"])
      .default("development"),
    HOST: z.string().min(1).default("127.0.0.1"),
    PORT: z.coerce
      .number({ error: "PORT must be a number" })
      .int("PORT must be a whole number")
      .min(1, "PORT must be between 1 and 65535")
      .max(65535, "PORT must be between 1 and 65535")
      .default(3000),
    // Server processes on one port: a whole number, or "auto" for one per
    // core (server.ts; app/processes).
    WEB_CONCURRENCY: z
      .union(
        [
          z.literal("auto"),
          z.coerce
            .number({ error: WEB_CONCURRENCY_RULE })
            .int(WEB_CONCURRENCY_RULE)
            .min(1, WEB_CONCURRENCY_RULE)
            .max(64, WEB_CONCURRENCY_RULE),
        ],
        { error: WEB_CONCURRENCY_RULE },
      )
      .default(1),
    // The PostgreSQL schema of the job queue (pg-boss). Server processes that
    // share a database and this name share their jobs; a test server of its
    // own uses another, so no other server takes its jobs.
    JOB_QUEUE_SCHEMA: z
      .string()
      .regex(
        /^[a-z_][a-z0-9_]{0,49}$/,
        "JOB_QUEUE_SCHEMA must be a lower-case PostgreSQL name (letters, digits, _)",
      )
      .default("pgboss"),
    DATABASE_URL: z
      .string({ error: "DATABASE_URL is required (npm start sets it)" })
      .regex(/^postgres(ql)?:\/\//, "DATABASE_URL must start with postgres://"),
    // A streaming standby of DATABASE_URL's server: the ledger, the readings
    // views and the report data read from it (app/db/read-source.server.ts).
    // Empty means unset, so a deployment can switch the standby off.
    DATABASE_READ_URL: z.preprocess(
      (value) => (value === "" ? undefined : value),
      z
        .string()
        .regex(
          /^postgres(ql)?:\/\//,
          "DATABASE_READ_URL must start with postgres://",
        )
        .optional(),
    ),
    APP_URL: z.url("APP_URL must be an absolute URL").optional(),
    RESEND_API_KEY: z.string().min(1).default("re_local_fake_key"),
    RESEND_BASE_URL: z
      .url("RESEND_BASE_URL must be an absolute URL")
      .refine((u) => !u.endsWith("/"), "RESEND_BASE_URL must not end with /")
      .optional(),
    // Opens the whole development Outbox to the machine's operator
    // (npm start makes one and prints the link); unset, nobody reads all.
    OUTBOX_OPERATOR_KEY: z
      .string()
      .min(24, "OUTBOX_OPERATOR_KEY must be at least 24 characters")
      .optional(),
    EMAIL_FROM: z
      .string()
      .min(3)
      .default("Joulebook <no-reply@joulebook.localhost>"),
    DEMO_GATEWAY_KEY: z
      .string()
      .min(24, "DEMO_GATEWAY_KEY must be at least 24 characters")
      .optional(),
    // npm start's demo gateway (scripts/demo-feeder.ts) keeps the demo's
    // readings coming unless this is 0.
    DEMO_LIVE: z
      .enum(["0", "1"], { error: "DEMO_LIVE must be 0 (off) or 1 (on)" })
      .default("1"),
    TRUST_PROXY: z.enum(["0", "1"]).default("0"),
    // The test server counts session validations and membership reads per
    // request (app/auth/request-counters.server.ts); never set in production.
    JOULEBOOK_TEST_COUNTERS: z.enum(["0", "1"]).default("0"),
    ALERTS_INTERVAL_MINUTES: z.coerce
      .number({ error: "ALERTS_INTERVAL_MINUTES must be a number" })
      .int()
      .min(0, "ALERTS_INTERVAL_MINUTES must be 0 (off) or more")
      .default(15),
    GATEWAY_RATE_LIMIT_PER_MINUTE: z.coerce
      .number({ error: "GATEWAY_RATE_LIMIT_PER_MINUTE must be a number" })
      .int()
      .min(1, "GATEWAY_RATE_LIMIT_PER_MINUTE must be at least 1")
      .default(600),
    // Billing. With STRIPE_API_BASE set, the SDK talks to the local fake
    // (fakes/stripe-fake.ts); with a real key and no base, to Stripe itself.
    STRIPE_SECRET_KEY: z.string().min(1).default("sk_test_local_fake"),
    STRIPE_API_BASE: z
      .url("STRIPE_API_BASE must be an absolute URL")
      .refine((u) => !u.endsWith("/"), "STRIPE_API_BASE must not end with /")
      .optional(),
    STRIPE_WEBHOOK_SECRET: z
      .string()
      .startsWith("whsec_", "STRIPE_WEBHOOK_SECRET must start with whsec_")
      .default("whsec_local_fake_development_secret"),
    STRIPE_PRICE_LOOKUP_KEY: z
      .string()
      .min(1)
      .default("joulebook_metered_site_monthly"),
    BILLING_TRIAL_DAYS: z.coerce
      .number({ error: "BILLING_TRIAL_DAYS must be a number" })
      .int()
      .min(0)
      .max(90)
      .default(14),
    BILLING_GRACE_DAYS: z.coerce
      .number({ error: "BILLING_GRACE_DAYS must be a number" })
      .int()
      .min(0)
      .default(7),
    BILLING_RECONCILE_MINUTES: z.coerce
      .number({ error: "BILLING_RECONCILE_MINUTES must be a number" })
      .int()
      .min(0, "BILLING_RECONCILE_MINUTES must be 0 (off) or more")
      .default(60),
    // Report signing. Without a PKCS#12 file, `npm start` creates a local
    // signing CA and certificate once under SIGNING_DIR (.data/signing).
    REPORT_SIGNING_P12: z.string().min(1).optional(),
    REPORT_SIGNING_P12_PASSWORD: z.string().optional(),
    SIGNING_DIR: z.string().min(1).default(".data/signing"),
  })
  .refine(
    (env) => env.RESEND_BASE_URL || env.RESEND_API_KEY !== "re_local_fake_key",
    {
      message:
        "Set RESEND_BASE_URL to the local e-mail fake, or RESEND_API_KEY to a real key",
      path: ["RESEND_BASE_URL"],
    },
  )
  .refine(
    (env) =>
      env.STRIPE_API_BASE || env.STRIPE_SECRET_KEY !== "sk_test_local_fake",
    {
      message:
        "Set STRIPE_API_BASE to the local Stripe fake, or STRIPE_SECRET_KEY to a real key",
      path: ["STRIPE_API_BASE"],
    },
  )
  .refine((env) => !env.REPORT_SIGNING_P12 || env.REPORT_SIGNING_P12_PASSWORD, {
    message: "REPORT_SIGNING_P12 needs REPORT_SIGNING_P12_PASSWORD",
    path: ["REPORT_SIGNING_P12_PASSWORD"],
  });

export type Env = z.infer<typeof envSchema>;

export function parseEnv(source: NodeJS.ProcessEnv): Env {
  const result = envSchema.safeParse(source);
  if (result.success) return result.data;
  const lines = result.error.issues.map(
    (issue) => `  - ${issue.path.join(".") || "environment"}: ${issue.message}`,
  );
  throw new Error(`Invalid environment:\n${lines.join("\n")}`);
}

/** The number of server processes WEB_CONCURRENCY asks for. */
export function serverProcessCount(e: Pick<Env, "WEB_CONCURRENCY">): number {
  return e.WEB_CONCURRENCY === "auto"
    ? availableParallelism()
    : e.WEB_CONCURRENCY;
}

let cached: Env | undefined;

export function env(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}

/** The base URL used in e-mailed links. */
export function appUrl(): string {
  const e = env();
  return (
    e.APP_URL ??
    `http://${e.HOST === "0.0.0.0" ? "127.0.0.1" : e.HOST}:${e.PORT}`
  );
}

/** The Outbox exists only while mail goes to the local fake. */
export function outboxEnabled(): boolean {
  return Boolean(env().RESEND_BASE_URL);
}
