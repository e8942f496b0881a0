import { z } from "zod";

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
    DATABASE_URL: z
      .string({ error: "DATABASE_URL is required (npm start sets it)" })
      .regex(/^postgres(ql)?:\/\//, "DATABASE_URL must start with postgres://"),
    APP_URL: z.url("APP_URL must be an absolute URL").optional(),
    RESEND_API_KEY: z.string().min(1).default("re_local_fake_key"),
    RESEND_BASE_URL: z
      .url("RESEND_BASE_URL must be an absolute URL")
      .refine((u) => !u.endsWith("/"), "RESEND_BASE_URL must not end with /")
      .optional(),
    EMAIL_FROM: z
      .string()
      .min(3)
      .default("Joulebook <no-reply@joulebook.localhost>"),
    DEMO_GATEWAY_KEY: z
      .string()
      .min(24, "DEMO_GATEWAY_KEY must be at least 24 characters")
      .optional(),
    TRUST_PROXY: z.enum(["0", "1"]).default("0"),
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
  })
  .refine(
    (env) => env.RESEND_BASE_URL || env.RESEND_API_KEY !== "re_local_fake_key",
    {
      message:
        "Set RESEND_BASE_URL to the local e-mail fake, or RESEND_API_KEY to a real key",
      path: ["RESEND_BASE_URL"],
    },
  );

export type Env = z.infer<typeof envSchema>;

export function parseEnv(source: NodeJS.ProcessEnv): Env {
  const result = envSchema.safeParse(source);
  if (result.success) return result.data;
  const lines = result.error.issues.map(
    (issue) => `  - ${issue.path.join(".") || "environment"}: ${issue.message}`,
  );
  throw new Error(`Invalid environment:\n${lines.join("\n")}`);
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
