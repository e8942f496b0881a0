/**
 * Many server processes on one port (WEB_CONCURRENCY=2), with a server and a
 * job queue of the test's own (JOB_QUEUE_SCHEMA), so no other server takes
 * its jobs: health counts the processes, sign-in throttling holds across
 * them, and a report whose process is killed mid-job is finished by the
 * other process.
 */
import { randomUUID } from "node:crypto";
import { request } from "node:http";
import { sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createOrganization, db } from "../support/db";
import { Client } from "../support/http";
import { createMeteredOrg } from "../support/metered-org";
import { freePort, ServerProcess } from "../support/server-process";

const QUEUE_SCHEMA = "pgboss_processes_test";
/** Password guesses judged per address and client (docs/architecture.md). */
const MAX_GUESSES_PER_ADDRESS = 5;
/** The test server's gateway rate limit: small, so a few batches reach it. */
const GATEWAY_BATCHES_PER_MINUTE = 4;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

let server: ServerProcess;

/** A client of this test's server rather than the suite's. */
class ProcessClient extends Client {
  override readonly baseUrl = server.baseUrl;
}

interface Answer {
  status: number;
  /** The server process that answered (the test server names itself). */
  pid: number;
  body: string;
}

/**
 * One request on a connection of its own: the primary hands each new
 * connection to the next process in turn, so successive calls alternate.
 */
function freshRequest(
  path: string,
  options: { method?: string; body?: string; headers?: Record<string, string> },
): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const body = options.body ?? "";
    const req = request(
      `${server.baseUrl}${path}`,
      {
        agent: false,
        method: options.method ?? "GET",
        headers: {
          ...options.headers,
          "content-length": Buffer.byteLength(body),
        },
      },
      (res) => {
        let text = "";
        res.setEncoding("utf8");
        res.on("data", (chunk: string) => (text += chunk));
        res.on("end", () =>
          resolve({
            status: res.statusCode ?? 0,
            pid: Number(res.headers["x-joulebook-pid"]),
            body: text,
          }),
        );
      },
    );
    req.on("error", reject);
    req.end(body);
  });
}

async function health(): Promise<Answer & { processes: number }> {
  const answer = await freshRequest("/api/v1/health", {});
  return { ...answer, processes: JSON.parse(answer.body).processes };
}

/** Waits until health reports `count` serving processes. */
async function waitForProcesses(count: number, withinMs: number) {
  const deadline = Date.now() + withinMs;
  let last = 0;
  while (Date.now() < deadline) {
    last = (await health().catch(() => ({ processes: 0 }))).processes;
    if (last === count) return;
    await sleep(200);
  }
  throw new Error(`health reported ${last} processes, not ${count}`);
}

beforeAll(async () => {
  server = new ServerProcess(await freePort(), {
    WEB_CONCURRENCY: "2",
    JOB_QUEUE_SCHEMA: QUEUE_SCHEMA,
    TRUST_PROXY: "1",
    JOULEBOOK_TEST_COUNTERS: "1",
    GATEWAY_RATE_LIMIT_PER_MINUTE: String(GATEWAY_BATCHES_PER_MINUTE),
  });
  // Two processes load the app at once: on a busy machine that takes a while.
  await server.start(120_000);
  await waitForProcesses(2, 60_000);
}, 200_000);

afterAll(async () => {
  await server?.stop("SIGTERM");
  await db.execute(sql.raw(`drop schema if exists ${QUEUE_SCHEMA} cascade`));
});

describe("two server processes on one port", () => {
  it("health reports both, answering from each in turn", async () => {
    const answers = [await health(), await health(), await health()];
    expect(answers.map((a) => a.processes)).toEqual([2, 2, 2]);
    expect(new Set(answers.map((a) => a.pid)).size).toBe(2);
  });

  it("twelve wrong passwords for one address, sent to both processes in turn, are judged at most five times", async () => {
    const email = `guesser-${randomUUID().slice(0, 8)}@example.test`;
    // A client address of this test's own, so no other test's failures count.
    const clientAddress = `198.51.100.${Math.floor(Math.random() * 200) + 20}`;
    const answers: Answer[] = [];
    for (let i = 0; i < 12; i++)
      answers.push(
        await freshRequest("/sign-in", {
          method: "POST",
          headers: {
            "content-type": "application/x-www-form-urlencoded",
            "x-forwarded-for": clientAddress,
          },
          body: new URLSearchParams({
            email,
            password: `wrong-${i}`,
          }).toString(),
        }),
      );
    const judged = answers.filter((a) => a.status === 400);
    expect(judged).toHaveLength(MAX_GUESSES_PER_ADDRESS);
    expect(answers.map((a) => a.status)).toEqual([
      ...Array(MAX_GUESSES_PER_ADDRESS).fill(400),
      ...Array(12 - MAX_GUESSES_PER_ADDRESS).fill(429),
    ]);
    // Both processes judged some and refused some: the count is shared.
    expect(new Set(judged.map((a) => a.pid)).size).toBe(2);
    expect(
      new Set(answers.filter((a) => a.status === 429).map((a) => a.pid)).size,
    ).toBe(2);
  }, 90_000);

  it("a gateway's rate limit counts the batches both processes took", async () => {
    const org = await createMeteredOrg();
    const answers: Answer[] = [];
    for (let i = 0; i < GATEWAY_BATCHES_PER_MINUTE + 2; i++)
      answers.push(
        await freshRequest("/api/v1/readings", {
          method: "POST",
          headers: {
            "content-type": "application/json",
            authorization: `Bearer ${org.gatewayKey}`,
          },
          body: JSON.stringify({ readings: [] }),
        }),
      );
    // Each process alone saw no more than three: only a shared count refuses.
    expect(answers.map((a) => a.status === 429)).toEqual([
      ...Array(GATEWAY_BATCHES_PER_MINUTE).fill(false),
      true,
      true,
    ]);
    expect(new Set(answers.map((a) => a.pid)).size).toBe(2);
  });

  it("a report whose process is killed mid-job is finished by the other", async () => {
    const org = await createOrganization(["owner"]);
    const { email, password } = org.members[0];
    const client = new ProcessClient();
    await client.signIn(email, password);
    const made = await client.post(`/o/${org.id}/reports`, {
      scope: "all",
      period: "year:2025",
    });
    expect(made.status).toBe(200);
    const [report] = (
      await db.execute<{ id: string }>(
        sql`select id from reports where organization_id = ${org.id}`,
      )
    ).rows;

    // The process that took the job has claimed it under its pid.
    let pid: number | null = null;
    const deadline = Date.now() + 20_000;
    while (pid === null && Date.now() < deadline) {
      const [claim] = (
        await db.execute<{ pid: number }>(
          sql`select pid from job_claims where data->>'reportId' = ${report.id}`,
        )
      ).rows;
      if (claim) pid = claim.pid;
      else await sleep(5);
    }
    expect(pid, "a process claimed the report's job").not.toBeNull();
    process.kill(pid!, "SIGKILL");

    let status = "";
    const until = Date.now() + 45_000;
    while (Date.now() < until) {
      const [row] = (
        await db.execute<{ status: string }>(
          sql`select status from reports where id = ${report.id}`,
        )
      ).rows;
      status = row.status;
      if (status === "done" || status === "failed") break;
      await sleep(200);
    }
    expect(status).toBe("done");
    // The queue's record: one try failed (the killed one), the next
    // finished (the queue marks it completed just after the handler returns).
    const jobState = async () =>
      (
        await db.execute<{ state: string; retry_count: number }>(
          sql.raw(
            `select state, retry_count from ${QUEUE_SCHEMA}.job where id = '${report.id}'`,
          ),
        )
      ).rows[0];
    let job = await jobState();
    for (let i = 0; i < 50 && job.state === "active"; i++) {
      await sleep(100);
      job = await jobState();
    }
    expect(job).toEqual({ state: "completed", retry_count: 1 });
    // The primary replaced the killed process.
    await waitForProcesses(2, 60_000);
    const pids = new Set([(await health()).pid, (await health()).pid]);
    expect(pids.has(pid!)).toBe(false);
  }, 120_000);
});
