/**
 * `ensure_cluster` (scripts/lib.sh): a checkout's PostgreSQL cluster whose
 * port another program took meanwhile moves to the next free port and keeps
 * it, instead of failing (choosing a port and binding it are two steps, so
 * two checkouts set up at once can pick the same one).
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { createServer, type Server } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runLibSh } from "../support/lib-sh";

const haveClusterTools =
  process.platform === "linux" &&
  runLibShSync("pg_bindir >/dev/null && echo yes") === "yes";

function runLibShSync(body: string): string {
  try {
    return execFileSync("bash", ["-c", `source scripts/lib.sh\n${body}`], {
      encoding: "utf8",
    }).trim();
  } catch {
    return "";
  }
}

const dataDir = mkdtempSync(join(tmpdir(), "jb-cluster-port-"));
afterAll(async () => {
  await runLibSh("stop_cluster", { JOULEBOOK_DATA_DIR: dataDir });
  rmSync(dataDir, { recursive: true, force: true });
});

const listen = (port: number) =>
  new Promise<Server>((resolve, reject) => {
    const server = createServer().listen(port, "127.0.0.1", () =>
      resolve(server),
    );
    server.once("error", reject);
  });

describe.skipIf(!haveClusterTools)("the cluster's port", () => {
  it("moves to the next free port when its own was taken, and keeps it", async () => {
    const env = { JOULEBOOK_DATA_DIR: dataDir, JOULEBOOK_PG_PORT: "55429" };
    const first = await runLibSh("ensure_cluster && stop_cluster", env);
    expect(first.code, first.stderr).toBe(0);
    const recorded = Number(readFileSync(join(dataDir, "pg-port"), "utf8"));

    const squatter = await listen(recorded);
    try {
      const moved = await runLibSh(
        'ensure_cluster && psql_admin -c "select 42"',
        env,
      );
      expect(moved.code, moved.stderr).toBe(0);
      expect(moved.stdout).toContain(`Port ${recorded} is taken`);
      expect(moved.stdout).toContain("42");
      const now = Number(readFileSync(join(dataDir, "pg-port"), "utf8"));
      expect(now).toBeGreaterThan(recorded);
    } finally {
      await new Promise((r) => squatter.close(r));
    }
  }, 120_000);
});
