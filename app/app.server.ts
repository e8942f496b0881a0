/**
 * The Express application: the JSON API and the React Router handler. It is
 * the SSR build's entry (vite.config.ts), so both share one module graph and
 * one database pool. server.ts owns the process: listening, static files,
 * security headers, shutdown.
 */
import { createRequestHandler } from "@react-router/express";
import express from "express";
import { RouterContextProvider } from "react-router";
import { apiRouter } from "./api/router.server";
import { pool } from "./db/client.server";
import { closeReadPool, markWrites } from "./db/read-source.server";
import { databaseGate } from "./db/unavailable.server";
import { estimationIdle } from "./ingest/after-ingest.server";
import { requestInfoContext } from "./request-context";
import { countingUnder, takeCounts } from "./auth/request-counters.server";
import { env } from "./env.server";
import { startJobHandlers } from "./jobs/handlers.server";
import { stopQueue } from "./jobs/queue.server";

export const app = express();

// Tests count the work one request does (the test server only): a request
// carrying `x-joulebook-count: <key>` is tallied, and the tally is read back
// from /__counters/<key>. Each answer names the process that served it, so
// tests of several processes know which one answered.
if (env().JOULEBOOK_TEST_COUNTERS === "1") {
  app.use((_req, res, next) => {
    res.setHeader("x-joulebook-pid", String(process.pid));
    next();
  });
  app.get("/__counters/:key", (req, res) => {
    res.json(takeCounts(req.params.key));
  });
  app.use((req, _res, next) => {
    const key = req.get("x-joulebook-count");
    if (key) countingUnder(key, next);
    else next();
  });
}

app.use(databaseGate);
app.use(markWrites);
app.use("/api/v1", apiRouter());

app.use(
  createRequestHandler({
    build: () => import("virtual:react-router/server-build"),
    getLoadContext(req) {
      const context = new RouterContextProvider();
      context.set(requestInfoContext, { clientAddress: req.ip ?? "unknown" });
      return context;
    },
  }),
);

/**
 * Starts this process's share of the background work: it takes jobs from the
 * PostgreSQL queue (reports, alerts, billing reconciliation, housekeeping).
 * server.ts calls it once, after the supervisor has prepared the queue.
 */
export async function startBackgroundWork(): Promise<void> {
  await startJobHandlers();
}

/**
 * Stops taking jobs (a report still being made after a few seconds is
 * handed back to the queue for another process), finishes estimation
 * already queued, then closes the pool.
 */
export async function closeResources(): Promise<void> {
  await stopQueue(3_000);
  await estimationIdle();
  await Promise.all([pool.end(), closeReadPool()]);
}
