/**
 * The queue as a server process sees it: sending jobs, and working them one
 * at a time per queue. pg-boss runs on the process's own pool, so the queue
 * shares its connections and its outage handling (app/db/availability).
 * The queue's schema and queues are made by the supervisor
 * (supervisor.server.ts) before this process starts.
 *
 * Each job a process takes is claimed in `job_claims` with this machine and
 * pid, so the primary can hand it to another process the moment this one
 * dies; the queue's expiry is the slower net for a lost machine.
 */
import { hostname } from "node:os";
import { eq } from "drizzle-orm";
import PgBoss from "pg-boss";
import { db, pool } from "~/db/client.server";
import { jobClaims } from "~/db/schema";
import { env } from "~/env.server";
import type { QueueName } from "./queues";

// One connection to the queue per process; kept on globalThis, as the pool
// is, so Vite's dev reloads of this module reuse it.
const state = globalThis as unknown as {
  joulebookQueue?: { boss: PgBoss; workerIds: Map<QueueName, string> };
};

function queue(): PgBoss {
  if (!state.joulebookQueue)
    throw new Error(
      "The job queue is not started in this process (startQueue).",
    );
  return state.joulebookQueue.boss;
}

/** Connects this process to the queue the supervisor prepared. */
export async function startQueue(): Promise<void> {
  if (state.joulebookQueue) return;
  const boss = new PgBoss({
    db: { executeSql: (text, values) => pool.query(text, values) },
    schema: env().JOB_QUEUE_SCHEMA,
    migrate: false,
    supervise: false,
    schedule: false,
  });
  boss.on("error", (error) => console.error("[jobs]", error));
  await boss.start();
  state.joulebookQueue = { boss, workerIds: new Map() };
}

/** Stops taking jobs; a job still running after `timeoutMs` is failed for a retry. */
export async function stopQueue(timeoutMs: number): Promise<void> {
  const stopping = state.joulebookQueue;
  state.joulebookQueue = undefined;
  await stopping?.boss.stop({
    graceful: true,
    timeout: timeoutMs,
    close: false,
  });
}

/**
 * Sends a job. An `id` makes sending idempotent: a second send with the same
 * id is ignored while the first job is kept. The job is taken at once when
 * this process works that queue and is idle, else at the next poll.
 */
export async function sendJob(
  name: QueueName,
  data: object,
  options: { id?: string } = {},
): Promise<void> {
  const q = queue();
  await q.send(name, data, options);
  const workerId = state.joulebookQueue?.workerIds.get(name);
  if (workerId) q.notifyWorker(workerId);
}

export interface JobAttempt<T> {
  id: string;
  data: T;
  /** 0 on the first try. */
  retryCount: number;
  retryLimit: number;
}

async function claimJob(name: QueueName, job: PgBoss.Job<object>) {
  const claim = {
    queue: name,
    data: job.data,
    host: hostname(),
    pid: process.pid,
  };
  await db
    .insert(jobClaims)
    .values({ jobId: job.id, ...claim })
    .onConflictDoUpdate({
      target: jobClaims.jobId,
      set: { ...claim, startedAt: new Date() },
    });
}

/**
 * Works a queue in this process, one job at a time. The handler throws to
 * fail the try; the queue retries it with back-off up to the queue's limit.
 */
export async function workQueue<T extends object>(
  name: QueueName,
  pollingIntervalSeconds: number,
  handler: (job: JobAttempt<T>) => Promise<void>,
): Promise<void> {
  const workerId = await queue().work<T>(
    name,
    { batchSize: 1, pollingIntervalSeconds, includeMetadata: true },
    async ([job]) => {
      await claimJob(name, job);
      try {
        await handler({
          id: job.id,
          data: job.data,
          retryCount: job.retryCount,
          retryLimit: job.retryLimit,
        });
      } finally {
        await db.delete(jobClaims).where(eq(jobClaims.jobId, job.id));
      }
    },
  );
  state.joulebookQueue?.workerIds.set(name, workerId);
}
