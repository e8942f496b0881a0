/**
 * A local stand-in for the part of the Stripe API Joulebook uses, driven by
 * the real `stripe` SDK (API version 2026-10-28.endive): customers, prices,
 * subscriptions with prorations, invoices, Checkout and the billing portal
 * (as plainly labelled test pages), signed webhooks, and test controls under
 * /_fake (clock, failing payments, event log). Anything it does not implement
 * answers a Stripe-shaped error, never a body the SDK would take for success.
 *
 * Run alone: `node --import tsx fakes/stripe-fake.ts` with STRIPE_FAKE_PORT
 * (else a free port, which it prints; see fakes/listen-as-script.ts),
 * STRIPE_FAKE_WEBHOOK_URL, STRIPE_WEBHOOK_SECRET and optionally
 * STRIPE_FAKE_STATE_FILE to keep its objects across restarts.
 */
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import express, { type Request, type Response } from "express";
import { exitOnFailure, listenAsScript } from "./listen-as-script";
import { billingRoutes } from "./stripe/api-billing";
import { catalogRoutes } from "./stripe/api-catalog";
import { createContext, type Ctx } from "./stripe/context";
import { controlRoutes } from "./stripe/controls";
import { StripeFakeError, stripeErrorHandler } from "./stripe/errors";
import { idempotency, requestId, requireTestKey } from "./stripe/http";
import { pageRoutes } from "./stripe/pages";
import { loadState, saveState } from "./stripe/store";
import { WebhookBus } from "./stripe/webhooks";

export interface StripeFakeOptions {
  /** Where events are POSTed; none means they are only logged. */
  webhookUrl?: string;
  webhookSecret?: string;
  /** A JSON file that keeps the fake's objects across restarts. */
  stateFile?: string;
  /** Waits between delivery attempts of one event (one retry per entry). */
  retryDelaysMs?: number[];
  /** Base URL of the fake's pages; by default the address it listens on. */
  publicUrl?: string;
}

export interface RunningStripeFake {
  url: string;
  port: number;
  server: Server;
  /** Waits for queued webhook deliveries unless told not to. */
  close(options?: { flush?: boolean }): Promise<void>;
}

export const DEFAULT_WEBHOOK_SECRET = "whsec_local_fake_development_secret";

export function createStripeFake(options: StripeFakeOptions = {}) {
  const state = loadState(options.stateFile);
  const bus = new WebhookBus(state, options.retryDelaysMs ?? [250, 1000, 3000]);
  if (options.webhookUrl)
    bus.endpoint = {
      url: options.webhookUrl,
      secret: options.webhookSecret ?? DEFAULT_WEBHOOK_SECRET,
    };
  let baseUrl = options.publicUrl ?? "";
  const ctx = createContext(state, bus, () => baseUrl);
  const persist = () => saveState(options.stateFile, state);
  const app = buildApp(ctx, persist);

  async function listen(
    port = 0,
    host = "127.0.0.1",
  ): Promise<RunningStripeFake> {
    const server = app.listen(port, host);
    await new Promise<void>((resolve, reject) => {
      server.once("listening", resolve);
      server.once("error", reject);
    });
    const actual = (server.address() as AddressInfo).port;
    const url = `http://${host}:${actual}`;
    baseUrl ||= url;
    const close = async ({ flush = true } = {}) => {
      if (flush) await bus.flush();
      persist();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    };
    return { url, port: actual, server, close };
  }

  return { app, ctx, listen, flush: () => bus.flush() };
}

function buildApp(ctx: Ctx, persist: () => void) {
  const app = express();
  app.set("query parser", "extended");
  app.disable("x-powered-by");
  app.use(requestId);
  // Every change is written to the state file once its answer is out.
  app.use((req, res, next) => {
    if (req.method !== "GET") res.on("finish", persist);
    next();
  });
  app.use(controlRoutes(ctx));
  app.use(express.urlencoded({ extended: true, limit: "1mb" }));
  app.use("/v1", requireTestKey, idempotency());
  app.use(catalogRoutes(ctx));
  app.use(billingRoutes(ctx));
  app.use(pageRoutes(ctx));
  app.use((req: Request, res: Response) => {
    const message = `Unrecognized request URL (${req.method}: ${req.path}): the local Stripe fake does not implement it.`;
    res
      .status(404)
      .json(new StripeFakeError(404, "invalid_request_error", message).body());
  });
  app.use(stripeErrorHandler);
  return app;
}

const isEntryPoint = process.argv[1]?.endsWith("stripe-fake.ts");
if (isEntryPoint) {
  const fake = createStripeFake({
    webhookUrl: process.env.STRIPE_FAKE_WEBHOOK_URL || undefined,
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET || undefined,
    stateFile: process.env.STRIPE_FAKE_STATE_FILE || undefined,
  });
  exitOnFailure("stripe-fake", async () => {
    const running = await listenAsScript(
      "stripe-fake",
      "STRIPE_FAKE_PORT",
      (port) => fake.listen(port),
    );
    console.log(`[stripe-fake] listening on ${running.url}`);
    const stop = () => {
      // Shutting down must not wait for a dead endpoint's retries.
      void running.close({ flush: false }).then(() => process.exit(0));
    };
    process.on("SIGTERM", stop);
    process.on("SIGINT", stop);
  });
}
