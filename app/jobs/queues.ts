/**
 * The PostgreSQL job queue's queues (pg-boss, in its own `pgboss` schema):
 * their names, how each retries, and how often the periodic ones run. Plain
 * data, read by the primary that creates the queues and by the server
 * processes that work them.
 */

export const REPORT_QUEUE = "report";
/** Report jobs that ran out of tries land here, to mark their report failed. */
export const REPORT_ABANDONED_QUEUE = "report-abandoned";
export const ALERTS_QUEUE = "alerts";
export const BILLING_RECONCILE_QUEUE = "billing-reconcile";
export const HOUSEKEEPING_QUEUE = "housekeeping";

export type QueueName =
  | typeof REPORT_QUEUE
  | typeof REPORT_ABANDONED_QUEUE
  | typeof ALERTS_QUEUE
  | typeof BILLING_RECONCILE_QUEUE
  | typeof HOUSEKEEPING_QUEUE;

export interface QueueSettings {
  /**
   * standard: every job runs; stately: at most one waiting and one running,
   * so a slow periodic run is never overlapped or piled up behind.
   */
  policy: "standard" | "stately";
  /** Tries after the first; each waits retryDelay seconds, doubling. */
  retryLimit: number;
  retryDelay: number;
  retryBackoff: true;
  /**
   * A job still active after this long is failed and retried by the queue's
   * supervisor: what catches a machine lost with its primary. A server
   * process that dies is caught at once by its primary (job claims).
   */
  expireInSeconds: number;
  deadLetter?: QueueName;
}

export const queueSettings: Record<QueueName, QueueSettings> = {
  // A year's report takes seconds; ten minutes is far beyond any real one.
  [REPORT_QUEUE]: {
    policy: "standard",
    retryLimit: 2,
    retryDelay: 2,
    retryBackoff: true,
    expireInSeconds: 600,
    deadLetter: REPORT_ABANDONED_QUEUE,
  },
  [REPORT_ABANDONED_QUEUE]: {
    policy: "standard",
    retryLimit: 5,
    retryDelay: 5,
    retryBackoff: true,
    expireInSeconds: 60,
  },
  [ALERTS_QUEUE]: {
    policy: "stately",
    retryLimit: 2,
    retryDelay: 30,
    retryBackoff: true,
    expireInSeconds: 15 * 60,
  },
  [BILLING_RECONCILE_QUEUE]: {
    policy: "stately",
    retryLimit: 2,
    retryDelay: 60,
    retryBackoff: true,
    expireInSeconds: 30 * 60,
  },
  [HOUSEKEEPING_QUEUE]: {
    policy: "stately",
    retryLimit: 2,
    retryDelay: 60,
    retryBackoff: true,
    expireInSeconds: 10 * 60,
  },
};

/** Every queue, dead-letter targets first (a queue names its target). */
export const queueNames: QueueName[] = [
  REPORT_ABANDONED_QUEUE,
  REPORT_QUEUE,
  ALERTS_QUEUE,
  BILLING_RECONCILE_QUEUE,
  HOUSEKEEPING_QUEUE,
];

/**
 * A cron expression (UTC) for "every `minutes` minutes", which is what the
 * queue's scheduler understands. Under an hour it is `*\/m` within each hour
 * (a period that does not divide 60 restarts at the hour); from an hour up
 * it is rounded to whole hours, and from a day up it is daily at midnight.
 */
export function cronEvery(minutes: number): string {
  if (!Number.isInteger(minutes) || minutes < 1)
    throw new Error(`A period of ${minutes} minutes cannot be scheduled.`);
  if (minutes === 1) return "* * * * *";
  if (minutes < 60) return `*/${minutes} * * * *`;
  const hours = Math.round(minutes / 60);
  if (hours === 1) return "0 * * * *";
  if (hours < 24) return `0 */${hours} * * *`;
  return "0 0 * * *";
}

/** What the periodic queues run, given the environment's periods (0 = off). */
export function periodicSchedules(periods: {
  alertsMinutes: number;
  reconcileMinutes: number;
}): { queue: QueueName; cron: string | null }[] {
  const every = (minutes: number) => (minutes > 0 ? cronEvery(minutes) : null);
  return [
    { queue: ALERTS_QUEUE, cron: every(periods.alertsMinutes) },
    { queue: BILLING_RECONCILE_QUEUE, cron: every(periods.reconcileMinutes) },
    // Expired sessions, old sign-in attempts and spent reset links.
    { queue: HOUSEKEEPING_QUEUE, cron: "0 * * * *" },
  ];
}
