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
import { estimationIdle } from "./ingest/after-ingest.server";
import { requestInfoContext } from "./request-context";
import { runAllAlerts } from "./alerts/run-alerts.server";
import { env } from "./env.server";

export const app = express();

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

// Alert conditions are checked on a timer in the serving process; with
// several servers, the open-alert unique index keeps each e-mail single.
const alertMinutes = env().ALERTS_INTERVAL_MINUTES;
const alertTimer =
  alertMinutes > 0
    ? setInterval(() => void runAllAlerts(), alertMinutes * 60_000)
    : null;
alertTimer?.unref();

/** Finishes estimation already queued, then closes the pool. */
export async function closeResources(): Promise<void> {
  if (alertTimer) clearInterval(alertTimer);
  await estimationIdle();
  await pool.end();
}
