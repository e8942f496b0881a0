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

/** Finishes estimation already queued, then closes the pool. */
export async function closeResources(): Promise<void> {
  await estimationIdle();
  await pool.end();
}
