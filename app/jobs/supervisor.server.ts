/**
 * The queue's supervising side, run once per machine by the primary process
 * (server.ts) before any server process starts: it creates or upgrades
 * pg-boss's schema and the queues, keeps the periodic schedules, expires jobs
 * whose process vanished, and fails at once the jobs of a server process that
 * died here, so another process retries them.
 *
 * Relative imports only: server.ts loads this module directly, outside the
 * app's build.
 */
import { hostname } from "node:os";
import PgBoss from "pg-boss";
import {
  periodicSchedules,
  queueNames,
  queueSettings,
  REPORT_QUEUE,
} from "./queues";

export interface Supervisor {
  /** Fails the jobs a dead server process (of this machine) had claimed. */
  releaseJobsOf(pid: number): Promise<number>;
  stop(): Promise<void>;
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

export async function startSupervisor(options: {
  databaseUrl: string;
  schema: string;
  alertsMinutes: number;
  reconcileMinutes: number;
}): Promise<Supervisor> {
  const boss = new PgBoss({
    connectionString: options.databaseUrl,
    schema: options.schema,
    max: 2,
    application_name: "joulebook-queue-supervisor",
    // Expired jobs are found within a minute of their expiry.
    maintenanceIntervalSeconds: 60,
  });
  boss.on("error", (error) => console.error("[jobs] supervisor:", error));
  await boss.start();
  for (const name of queueNames) {
    await boss.createQueue(name, { name, ...queueSettings[name] });
    // createQueue keeps an existing queue's settings; these are the truth.
    await boss.updateQueue(name, { name, ...queueSettings[name] });
  }
  for (const { queue, cron } of periodicSchedules(options)) {
    if (cron) await boss.schedule(queue, cron, {}, { tz: "UTC" });
    else await boss.unschedule(queue);
  }
  const sql = (text: string, values: unknown[] = []) =>
    boss.getDb().executeSql(text, values);
  const host = hostname();

  async function releaseJobsOf(pid: number): Promise<number> {
    const { rows } = await sql(
      `delete from job_claims where host = $1 and pid = $2
       returning job_id, queue`,
      [host, pid],
    );
    for (const row of rows as { job_id: string; queue: string }[])
      await boss.fail(row.queue, row.job_id, {
        message: `server process ${pid} stopped while running this job`,
      });
    return rows.length;
  }

  await releaseDeadClaims(sql, host, releaseJobsOf);
  await requeueLostReports(sql, boss);
  return {
    releaseJobsOf,
    stop: () => boss.stop({ graceful: true, timeout: 3_000 }),
  };
}

type Sql = (text: string, values?: unknown[]) => Promise<{ rows: unknown[] }>;

/** Claims left by processes of this machine that are gone (a restart). */
async function releaseDeadClaims(
  sql: Sql,
  host: string,
  releaseJobsOf: (pid: number) => Promise<number>,
): Promise<void> {
  const { rows } = await sql(
    "select distinct pid from job_claims where host = $1",
    [host],
  );
  for (const { pid } of rows as { pid: number }[])
    if (!alive(pid)) await releaseJobsOf(pid);
  // Claims of other machines that long outlived any job's expiry.
  await sql(
    "delete from job_claims where started_at < now() - interval '1 day'",
  );
}

/**
 * A report request whose job was never sent (the process stopped between
 * the commit and the send) gets its job now. The job's id is the report's,
 * so a report that already has one is not queued twice.
 */
async function requeueLostReports(sql: Sql, boss: PgBoss): Promise<void> {
  const { rows } = await sql(
    "select organization_id, id from reports where status in ('queued', 'running')",
  );
  for (const row of rows as { organization_id: string; id: string }[])
    await boss.send(
      REPORT_QUEUE,
      { organizationId: row.organization_id, reportId: row.id },
      { id: row.id },
    );
}
