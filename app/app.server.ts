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
import { runAllAlerts } from "./alerts/run-alerts.server";
import { env } from "./env.server";
import { pruneAuthRecords } from "./auth/housekeeping.server";
import { reconcileBilling } from "./billing/reconcile.server";
import { reportJobsIdle, resumeReportJobs } from "./reports/report-jobs.server";

export const app = express();

// Tests count the work one request does (the test server only): a request
// carrying `x-joulebook-count: <key>` is tallied, and the tally is read back
// from /__counters/<key>.
if (env().JOULEBOOK_TEST_COUNTERS === "1") {
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

// Alert conditions are checked on a timer in the serving process; with
// several servers, the open-alert unique index keeps each e-mail single.
const alertMinutes = env().ALERTS_INTERVAL_MINUTES;
const alertTimer =
  alertMinutes > 0
    ? setInterval(
        () =>
          void runAllAlerts().catch((error) =>
            console.error("[alerts] run failed", error),
          ),
        alertMinutes * 60_000,
      )
    : null;
alertTimer?.unref();

// Reports left queued by a restart, or running in a process that died, are
// picked up at start and then every minute.
const resumeReports = () =>
  void resumeReportJobs().catch((error) =>
    console.error("[reports] could not resume jobs", error),
  );
resumeReports();
const reportTimer = setInterval(resumeReports, 60_000);
reportTimer.unref();

// Stripe's subscription quantities are checked against the estate on a
// timer, repairing any sync that failed while Stripe was unreachable.
const reconcileMinutes = env().BILLING_RECONCILE_MINUTES;
const reconcileTimer =
  reconcileMinutes > 0
    ? setInterval(
        () =>
          void reconcileBilling().catch((error) =>
            console.error("[billing] reconciliation run failed", error),
          ),
        reconcileMinutes * 60_000,
      )
    : null;
reconcileTimer?.unref();

// Expired sessions, old sign-in attempts and spent reset links, hourly.
const housekeepingTimer = setInterval(
  () =>
    void pruneAuthRecords().catch((error) =>
      console.error("[housekeeping] pruning failed", error),
    ),
  60 * 60_000,
);
housekeepingTimer.unref();

/** Finishes estimation already queued, then closes the pool. */
export async function closeResources(): Promise<void> {
  if (alertTimer) clearInterval(alertTimer);
  if (reconcileTimer) clearInterval(reconcileTimer);
  clearInterval(reportTimer);
  clearInterval(housekeepingTimer);
  await reportJobsIdle();
  await estimationIdle();
  await Promise.all([pool.end(), closeReadPool()]);
}
