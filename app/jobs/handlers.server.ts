/**
 * What each queue does, worked by every server process: the queue hands each
 * job to exactly one of them. Periodic jobs are sent by the supervisor's
 * schedules (queues.ts); report jobs by the request that asked for one.
 */
import { runAllAlerts } from "~/alerts/run-alerts.server";
import { pruneAuthRecords } from "~/auth/housekeeping.server";
import { reconcileBilling } from "~/billing/reconcile.server";
import {
  abandonReport,
  runReportJob,
  type ReportJobKey,
} from "~/reports/report-jobs.server";
import {
  ALERTS_QUEUE,
  BILLING_RECONCILE_QUEUE,
  HOUSEKEEPING_QUEUE,
  REPORT_ABANDONED_QUEUE,
  REPORT_QUEUE,
} from "./queues";
import { startQueue, workQueue } from "./queue.server";

/** Seconds between polls when idle; a report sent here is taken at once. */
const REPORT_POLL_SECONDS = 1;
const PERIODIC_POLL_SECONDS = 10;

export async function startJobHandlers(): Promise<void> {
  await startQueue();
  await workQueue<ReportJobKey>(
    REPORT_QUEUE,
    REPORT_POLL_SECONDS,
    runReportJob,
  );
  await workQueue<ReportJobKey>(
    REPORT_ABANDONED_QUEUE,
    PERIODIC_POLL_SECONDS,
    (job) => abandonReport(job.data),
  );
  await workQueue(ALERTS_QUEUE, PERIODIC_POLL_SECONDS, async () => {
    await runAllAlerts();
  });
  // The job's id names the run in Stripe's idempotency keys, so a run
  // retried (after a crash, or because Stripe was away for some accounts)
  // repeats no quantity change it already made.
  await workQueue(
    BILLING_RECONCILE_QUEUE,
    PERIODIC_POLL_SECONDS,
    async (job) => {
      const outcomes = await reconcileBilling(job.id);
      const failed = outcomes.filter((o) => o.result === "failed").length;
      if (failed)
        throw new Error(
          `${failed} of ${outcomes.length} accounts could not be reconciled`,
        );
    },
  );
  await workQueue(HOUSEKEEPING_QUEUE, PERIODIC_POLL_SECONDS, async () => {
    await pruneAuthRecords();
  });
}
