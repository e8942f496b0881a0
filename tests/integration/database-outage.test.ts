/**
 * PostgreSQL stops and starts again under a running server: the process
 * stays up, answers 503 with a reason and Retry-After while the database is
 * away (JSON on the API, a page for people), and serves again by itself.
 *
 * It stops the suite's own test cluster, so it runs only where npm test
 * manages that cluster (JOULEBOOK_PG_DIR); the suite's shared server goes
 * through the same outage, and the tests after this file show it recovered.
 */
import { execFileSync } from "node:child_process";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { pool } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";
import { freePort, ServerProcess } from "../support/server-process";

const PG_DIR = process.env.JOULEBOOK_PG_DIR;
const PG_BIN = process.env.JOULEBOOK_PG_BIN;
const RECOVERY_DEADLINE_MS = 15_000;

/** pg_ctl as the cluster's owner (PostgreSQL refuses to run as root). */
function pgCtl(...args: string[]): void {
  const command = [`${PG_BIN}/pg_ctl`, "-D", PG_DIR!, "-w", ...args];
  const asRoot = process.getuid?.() === 0;
  execFileSync(
    asRoot ? "runuser" : command[0],
    asRoot ? ["-u", "postgres", "--", ...command] : command.slice(1),
    { stdio: "ignore", timeout: 60_000 },
  );
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe.skipIf(!PG_DIR || !PG_BIN)("a database outage", () => {
  let server: ServerProcess;
  let org: MeteredOrg;

  beforeAll(async () => {
    org = await createMeteredOrg();
    server = new ServerProcess(await freePort());
    await server.start();
  });

  afterAll(async () => {
    // Whatever happened, leave the cluster running for the next files.
    try {
      pgCtl("status");
    } catch {
      pgCtl("-l", `${PG_DIR}/server.log`, "start");
    }
    await server?.stop("SIGTERM");
    await pool.end();
  });

  const reading = (hour: number) => ({
    meter: org.meters.water.code,
    quantity: "water_heat",
    start: new Date(Date.UTC(2024, 0, 1, hour)).toISOString(),
    end: new Date(Date.UTC(2024, 0, 1, hour + 1)).toISOString(),
    volume_m3: 1.5,
    flow_temp_c: 70,
    return_temp_c: 45,
  });

  const postReadings = (hour: number) =>
    fetch(`${server.baseUrl}/api/v1/readings`, {
      method: "POST",
      headers: {
        "content-type": "application/json",
        authorization: `Bearer ${org.gatewayKey}`,
      },
      body: JSON.stringify({ readings: [reading(hour)] }),
    });

  it("answers 503 while PostgreSQL is away and serves again by itself, in the same process", async () => {
    const pid = server.child!.pid;
    expect((await postReadings(0)).status).toBe(200);

    pgCtl("-m", "fast", "stop");
    try {
      const health = await fetch(`${server.baseUrl}/api/v1/health`);
      expect(health.status).toBe(503);
      expect((await health.json()).database).toBe("unreachable");

      const batch = await postReadings(1);
      expect(batch.status).toBe(503);
      expect(Number(batch.headers.get("retry-after"))).toBeGreaterThan(0);
      expect((await batch.json()).error.code).toBe("database_unavailable");

      const page = await fetch(`${server.baseUrl}/sign-in`);
      expect(page.status).toBe(503);
      expect(page.headers.get("content-type")).toContain("text/html");
      expect(await page.text()).toContain("cannot reach its database");

      // A few seconds away, and still the same process.
      await sleep(2_000);
      expect(server.child!.exitCode).toBeNull();
      expect((await fetch(`${server.baseUrl}/sign-in`)).status).toBe(503);
    } finally {
      pgCtl("-l", `${PG_DIR}/server.log`, "start");
    }

    const back = Date.now();
    let recovered = false;
    while (Date.now() - back < RECOVERY_DEADLINE_MS) {
      const response = await fetch(`${server.baseUrl}/sign-in`);
      if (response.status === 200) {
        recovered = true;
        break;
      }
      await sleep(250);
    }
    expect(
      recovered,
      "serving again within 15 s of the database's return",
    ).toBe(true);
    expect(server.child!.pid).toBe(pid);
    expect(server.child!.exitCode).toBeNull();

    // The batch refused during the outage is stored when sent again.
    const resent = await postReadings(1);
    expect(resent.status).toBe(200);
    expect((await resent.json()).accepted).toBe(1);
  });
});
