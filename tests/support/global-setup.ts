/**
 * Starts what the integration and browser suites talk to: the demo data in the
 * fresh test database (npm test created and migrated it), the local e-mail
 * and Stripe fakes, and the production server built by npm test, on free
 * loopback ports.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import type { AddressInfo } from "node:net";
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import type { TestProject } from "vitest/node";
import * as schema from "../../app/db/schema";
import { createResendFake } from "../../fakes/resend-fake";
import { createStripeFake } from "../../fakes/stripe-fake";
import { seedDemo } from "../../seeds/seed-demo";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    resendUrl: string;
    outboxOperatorKey: string;
    stripeUrl: string;
  }
}

async function freePort(): Promise<number> {
  const { createServer } = await import("node:net");
  return new Promise((resolve) => {
    const server = createServer().listen(0, "127.0.0.1", () => {
      const { port } = server.address() as AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

async function waitForHealth(url: string, child: ChildProcess): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null)
      throw new Error(`server exited with ${child.exitCode}`);
    try {
      const response = await fetch(`${url}/api/v1/health`);
      if (response.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error("server did not become healthy within 60 s");
}

export default async function setup(project: TestProject) {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl)
    throw new Error("DATABASE_URL is not set: run the tests with npm test");

  const pool = new pg.Pool({ connectionString: databaseUrl, max: 1 });
  await seedDemo(drizzle(pool, { schema }));
  await pool.end();

  const fake = createResendFake().listen(0, "127.0.0.1");
  await new Promise((r) => fake.once("listening", r));
  const resendUrl = `http://127.0.0.1:${(fake.address() as AddressInfo).port}`;

  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;

  // Started before the app so its first Stripe call finds it. Short retries
  // keep `POST /_fake/flush` quick when a test makes the webhook fail.
  const stripeWebhookSecret = "whsec_test_joulebook_fake";
  const stripeFake = await createStripeFake({
    webhookUrl: `${baseUrl}/api/v1/billing/webhook`,
    webhookSecret: stripeWebhookSecret,
    retryDelaysMs: [100, 300],
  }).listen(0, "127.0.0.1");
  const stripeUrl = stripeFake.url;

  const outboxOperatorKey = randomBytes(24).toString("base64url");
  const childEnv: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "production",
    PORT: String(port),
    HOST: "127.0.0.1",
    RESEND_BASE_URL: resendUrl,
    RESEND_API_KEY: "re_test_key",
    OUTBOX_OPERATOR_KEY: outboxOperatorKey,
    // As behind a proxy: tests speak for several clients by X-Forwarded-For.
    TRUST_PROXY: "1",
    STRIPE_API_BASE: stripeUrl,
    STRIPE_SECRET_KEY: "sk_test_joulebook",
    STRIPE_WEBHOOK_SECRET: stripeWebhookSecret,
    // Tests trigger billing reconciliation themselves.
    BILLING_RECONCILE_MINUTES: "0",
    // Low enough for a test to reach in a second or two.
    GATEWAY_RATE_LIMIT_PER_MINUTE: "120",
    // Tests run the alert check themselves, so its e-mails are predictable.
    ALERTS_INTERVAL_MINUTES: "0",
    // Per-request counts of session validations and membership reads.
    JOULEBOOK_TEST_COUNTERS: "1",
  };
  // A server spawned from vitest must not think it runs under vitest.
  delete childEnv.VITEST;
  const server = spawn(process.execPath, ["--import", "tsx", "server.ts"], {
    env: childEnv,
    stdio: ["ignore", "inherit", "inherit"],
  });
  await waitForHealth(baseUrl, server);

  project.provide("baseUrl", baseUrl);
  project.provide("resendUrl", resendUrl);
  project.provide("outboxOperatorKey", outboxOperatorKey);
  project.provide("stripeUrl", stripeUrl);

  return async () => {
    server.kill("SIGTERM");
    await new Promise((r) => server.once("exit", r));
    await new Promise((r) => fake.close(r));
    await stripeFake.close({ flush: false });
  };
}
