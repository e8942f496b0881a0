/**
 * The primary process when WEB_CONCURRENCY asks for several server processes:
 * it serves nothing itself. It starts the server processes (Node's cluster:
 * they share one port, and the primary hands connections round-robin), tells
 * them how many are serving, replaces one that dies (with back-off, so a crash
 * loop does not spin), hands the jobs a dead one was running back to the
 * queue, and on SIGTERM or SIGINT stops them all before it exits.
 *
 * Relative imports only: server.ts loads this module directly, outside the
 * app's build.
 */
import cluster, { type Worker } from "node:cluster";
import type { Supervisor } from "../jobs/supervisor.server";
import { nextRestart, type RestartState } from "./restart-backoff";
import type { ServingCountMessage } from "./serving-count";

/** How long the server processes get to finish before they are killed. */
const STOP_GRACE_MS = 10_000;

const log = (message: string) => console.log(`[joulebook] ${message}`);

export function runPrimary(options: {
  processes: number;
  supervisor: Supervisor;
}): void {
  const { supervisor } = options;
  const listening = new Set<number>();
  const startedAt = new Map<number, number>();
  const pendingRestarts = new Set<NodeJS.Timeout>();
  let restart: RestartState = { quickDeaths: 0 };
  let stopping = false;

  const workers = () =>
    Object.values(cluster.workers ?? {}).filter((w): w is Worker => !!w);

  function tellServingCount(): void {
    const message: ServingCountMessage = {
      type: "joulebook:serving-processes",
      count: listening.size,
    };
    for (const worker of workers())
      if (worker.isConnected()) worker.send(message);
  }

  function startOne(): void {
    const worker = cluster.fork();
    startedAt.set(worker.id, Date.now());
  }

  function replaceLater(worker: Worker): void {
    const lived = Date.now() - (startedAt.get(worker.id) ?? Date.now());
    const next = nextRestart(restart, lived);
    restart = next.state;
    log(`replacing server process ${worker.process.pid} in ${next.delayMs} ms`);
    const timer = setTimeout(() => {
      pendingRestarts.delete(timer);
      if (!stopping) startOne();
    }, next.delayMs);
    pendingRestarts.add(timer);
  }

  cluster.on("listening", (worker) => {
    listening.add(worker.id);
    tellServingCount();
  });

  cluster.on("exit", (worker, code, signal) => {
    listening.delete(worker.id);
    tellServingCount();
    const pid = worker.process.pid;
    if (pid)
      void supervisor
        .releaseJobsOf(pid)
        .then((released) => {
          if (released)
            log(
              `${released} job(s) of server process ${pid} handed back to the queue`,
            );
        })
        .catch((error) =>
          console.error(
            `[joulebook] could not release the jobs of ${pid}`,
            error,
          ),
        );
    if (!stopping) {
      log(`server process ${pid} exited (${signal ?? code})`);
      replaceLater(worker);
    }
    startedAt.delete(worker.id);
  });

  for (let i = 0; i < options.processes; i++) startOne();
  log(`primary ${process.pid}: starting ${options.processes} server processes`);

  async function stopAll(signal: string): Promise<void> {
    if (stopping) return;
    stopping = true;
    log(`${signal}: stopping ${workers().length} server processes`);
    for (const timer of pendingRestarts) clearTimeout(timer);
    const exited = Promise.all(
      workers().map(
        (worker) =>
          new Promise<void>((resolve) => {
            if (worker.isDead()) return resolve();
            worker.once("exit", () => resolve());
            worker.process.kill("SIGTERM");
          }),
      ),
    );
    const grace = new Promise<"late">((resolve) =>
      setTimeout(() => resolve("late"), STOP_GRACE_MS).unref(),
    );
    if ((await Promise.race([exited, grace])) === "late")
      for (const worker of workers()) worker.process.kill("SIGKILL");
    await supervisor.stop().catch(() => {});
    process.exit(0);
  }
  process.on("SIGTERM", () => void stopAll("SIGTERM"));
  process.on("SIGINT", () => void stopAll("SIGINT"));
}
