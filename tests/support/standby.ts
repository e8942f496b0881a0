/**
 * A streaming standby of the suite's own test cluster, on a free loopback
 * port, in a data folder of its own beside the cluster's: scripts/lib.sh's
 * start_standby (pg_basebackup -R, then pg_ctl start as the cluster's
 * owner). For tests of the read replica (DATABASE_READ_URL).
 */
import { readdirSync } from "node:fs";
import { dirname, join } from "node:path";
import pg from "pg";
import { pool as primary } from "./db";
import { runLibSh } from "./lib-sh";

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export interface Standby {
  /** DATABASE_URL's database, on the standby. */
  url: string;
  /** Resolves once the standby has replayed all the primary has written so far. */
  caughtUp(): Promise<void>;
  /** Stops replay (the standby keeps serving what it had), until resumeReplay. */
  pauseReplay(): Promise<void>;
  resumeReplay(): Promise<void>;
  /** Stops the standby and removes its folder. */
  stop(): Promise<void>;
}

async function shell(body: string, dataDir: string): Promise<void> {
  const result = await runLibSh(body, { JOULEBOOK_DATA_DIR: dataDir });
  if (result.code !== 0)
    throw new Error(`${body} failed:\n${result.stdout}\n${result.stderr}`);
}

/** Standby folders of test runs that were killed before they cleaned up. */
function leftoverStandbys(dataDir: string): string[] {
  return readdirSync(dataDir)
    .map((name) => /^standby-(\d+)$/.exec(name))
    .filter((match) => match !== null && !processAlive(Number(match[1])))
    .map((match) => join(dataDir, match![0]));
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** DATABASE_URL's database on a standby at `port`. */
export function standbyUrl(port: number): string {
  const url = new URL(process.env.DATABASE_URL!);
  url.port = String(port);
  return url.href;
}

/**
 * `pgDir`: the managed cluster's data folder (npm test's JOULEBOOK_PG_DIR);
 * `port`: a free one (a server may be given standbyUrl(port) meanwhile).
 */
export async function startStandby(
  pgDir: string,
  port: number,
): Promise<Standby> {
  const dataDir = dirname(pgDir);
  const dir = join(dataDir, `standby-${process.pid}`);
  const leftovers = [...leftoverStandbys(dataDir), dir].map(
    (old) => `stop_standby "${old}"\n`,
  );
  await shell(`${leftovers.join("")}start_standby "${dir}" ${port}`, dataDir);

  const url = standbyUrl(port);
  const standby = new pg.Pool({ connectionString: url, max: 1 });
  standby.on("error", () => {});

  const caughtUp = async () => {
    const { rows } = await primary.query<{ lsn: string }>(
      "select pg_current_wal_lsn()::text as lsn",
    );
    const deadline = Date.now() + 15_000;
    while (Date.now() < deadline) {
      const replayed = await standby.query<{ ok: boolean }>(
        "select pg_last_wal_replay_lsn() >= $1::pg_lsn as ok",
        [rows[0].lsn],
      );
      if (replayed.rows[0].ok) return;
      await sleep(50);
    }
    throw new Error(`the standby did not replay up to ${rows[0].lsn} in 15 s`);
  };

  const replayState = async (want: "paused" | "not paused") => {
    const deadline = Date.now() + 10_000;
    while (Date.now() < deadline) {
      const { rows } = await standby.query<{ state: string }>(
        "select pg_get_wal_replay_pause_state() as state",
      );
      if (rows[0].state === want) return;
      await sleep(20);
    }
    throw new Error(`replay did not become ${want}`);
  };

  let stopped = false;
  return {
    url,
    caughtUp,
    async pauseReplay() {
      await standby.query("select pg_wal_replay_pause()");
      await replayState("paused");
    },
    async resumeReplay() {
      await standby.query("select pg_wal_replay_resume()");
      await replayState("not paused");
    },
    async stop() {
      if (stopped) return;
      stopped = true;
      await standby.end();
      await shell(`stop_standby "${dir}"`, dataDir);
    },
  };
}
