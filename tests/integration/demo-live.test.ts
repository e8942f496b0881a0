/**
 * The live demo's gateway (scripts/demo-feeder.ts) against the suite's
 * server: a demo estate whose readings ended days ago is filled up to now
 * through the ingest API, a second start sends nothing again, DEMO_LIVE=0
 * leaves it alone, and the feeder ends when the script that started it does.
 */
import { isGasRegister } from "../../seeds/scenario/gas-supplies";
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { gatewayKeyPrefix } from "../../app/auth/gateway-keys.server";
import { hashToken } from "../../app/auth/tokens.server";
import { generateReadings } from "../../seeds/scenario/generate";
import { METERS } from "../../seeds/scenario/larchmere-estate";
import { appTestEnv, applyAppTestEnv } from "../support/app-env";
import { createOrganization, db, pool, schema } from "../support/db";
import { Client } from "../support/http";

const HOUR_MS = 3_600_000;
/** The seeded readings end this many days before the test runs. */
const DAYS_BEHIND = 3;
const hourFloor = (ms: number) => Math.floor(ms / HOUR_MS) * HOUR_MS;

const SEEDED_END = new Date(hourFloor(Date.now()) - DAYS_BEHIND * 24 * HOUR_MS);
const SEEDED_FROM = new Date(SEEDED_END.getTime() - 24 * HOUR_MS);
const installed = METERS.filter((m) => !m.removedAt);

let org: Awaited<ReturnType<typeof createOrganization>>;
let gatewayKey: string;
let appPool: { end(): Promise<void> } | null = null;
const children: ChildProcess[] = [];

afterAll(async () => {
  for (const child of children) if (child.exitCode === null) child.kill();
  await pool.end();
  await appPool?.end();
});

beforeAll(async () => {
  applyAppTestEnv();
  const [{ createEstate }, client] = await Promise.all([
    import("../../seeds/seed-estate"),
    import("../../app/db/client.server"),
  ]);
  appPool = client.pool;
  org = await createOrganization(["owner"]);
  expect(await createEstate(org.id)).toBe(true);
  gatewayKey = `jbgw_${randomBytes(32).toString("base64url")}`;
  await db.insert(schema.gateways).values({
    organizationId: org.id,
    name: "Live demo test gateway",
    keyHash: hashToken(gatewayKey),
    keyPrefix: gatewayKeyPrefix(gatewayKey),
  });
  // A day of the scenario that ended DAYS_BEHIND days ago, as a seed of
  // that day would have left it.
  const readings = [
    ...generateReadings({ from: SEEDED_FROM, to: SEEDED_END }),
  ].map((r) => r.reading);
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${gatewayKey}` },
  );
  expect(response.status).toBe(200);
  expect(await response.json()).toMatchObject({ rejected: [], conflicts: [] });
}, 60_000);

interface Feeder {
  child: ChildProcess;
  output(): string;
  /** Resolves with the first output line matching, or rejects when the feeder ends first. */
  line(pattern: RegExp): Promise<RegExpMatchArray>;
  exited: Promise<number | null>;
}

function feederEnv(extra: Record<string, string>): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    ...appTestEnv(),
    NODE_ENV: "production",
    DEMO_GATEWAY_KEY: gatewayKey,
    // The suite's server allows this many batches a minute.
    GATEWAY_RATE_LIMIT_PER_MINUTE: "120",
    ...extra,
  };
  delete env.VITEST;
  return env;
}

function watch(child: ChildProcess): Feeder {
  children.push(child);
  let output = "";
  child.stdout!.setEncoding("utf8").on("data", (c: string) => (output += c));
  child.stderr!.setEncoding("utf8").on("data", (c: string) => (output += c));
  const exited = new Promise<number | null>((resolve) =>
    child.once("exit", (code) => resolve(code)),
  );
  const line = (pattern: RegExp) =>
    new Promise<RegExpMatchArray>((resolve, reject) => {
      const check = () => {
        const match = output.match(pattern);
        if (match) resolve(match);
        return match;
      };
      if (check()) return;
      child.stdout!.on("data", check);
      void exited.then(() =>
        check() ? undefined : reject(new Error(`feeder ended:\n${output}`)),
      );
    });
  return { child, output: () => output, line, exited };
}

function startFeeder(extra: Record<string, string> = {}): Feeder {
  return watch(
    spawn(
      process.execPath,
      ["--import", "tsx", "scripts/demo-feeder.ts", inject("baseUrl")],
      { env: feederEnv(extra), stdio: ["ignore", "pipe", "pipe"] },
    ),
  );
}

async function stop(feeder: Feeder): Promise<number | null> {
  feeder.child.kill("SIGTERM");
  return feeder.exited;
}

/** Each demo meter's newest stored reading, by code. */
async function newestReadings(): Promise<Map<string, number>> {
  const { rows } = await pool.query<{ code: string; last: Date | null }>(
    `select m.code, max(r.reading_time) as last
       from meters m left join raw_readings r on r.organization_id = m.organization_id and r.meter_id = m.id
      where m.organization_id = $1 and m.removed_at is null group by m.code`,
    [org.id],
  );
  return new Map(rows.map((r) => [r.code, r.last?.getTime() ?? 0]));
}

async function storedCounts() {
  const { rows } = await pool.query<{
    readings: number;
    batches: number;
    conflicts: number;
  }>(
    `select (select count(*)::int from raw_readings where organization_id = $1) as readings,
            (select count(*)::int from ingest_batches where organization_id = $1) as batches,
            (select count(*)::int from reading_conflicts where organization_id = $1) as conflicts`,
    [org.id],
  );
  return rows[0];
}

const isRegister = (code: string) =>
  METERS.find((m) => m.code === code)!.quantity === "electric_register" ||
  isGasRegister(code);

describe("the live demo gateway", () => {
  it("does nothing with DEMO_LIVE=0: it says so and ends, the readings stay days old", async () => {
    const before = await storedCounts();
    const feeder = startFeeder({ DEMO_LIVE: "0" });
    expect(await feeder.exited).toBe(0);
    expect(feeder.output()).toContain("off (DEMO_LIVE=0)");
    expect(await storedCounts()).toEqual(before);
    const newest = await newestReadings();
    expect(Math.max(...newest.values())).toBe(SEEDED_END.getTime());
  }, 30_000);

  it("fills every demo meter from days ago up to the last hour that ended, then keeps running", async () => {
    const throughBefore = hourFloor(Date.now());
    const feeder = startFeeder();
    const [, posted] = await feeder.line(
      /up to date \(([\d,]+) readings posted\)/,
    );
    const throughAfter = hourFloor(Date.now());
    expect(Number(posted.replaceAll(",", ""))).toBeGreaterThanOrEqual(
      DAYS_BEHIND * 24 * installed.length,
    );
    // Each meter's newest reading closes the last hour that has ended: an
    // interval starting an hour before it, a register read at it.
    const newest = await newestReadings();
    expect([...newest.keys()].sort()).toEqual(
      installed.map((m) => m.code).sort(),
    );
    for (const [code, last] of newest) {
      const end = isRegister(code) ? last : last + HOUR_MS;
      expect([throughBefore, throughAfter], code).toContain(end);
    }
    // Every hour from the seeded day to now is measured: no hole, no
    // estimate, and no meter the overview would call silent.
    const { rows } = await pool.query<{ code: string; measured: number }>(
      `select m.code, count(*) filter (where i.quality = 'measured')::int as measured
         from meters m join intervals i on i.organization_id = m.organization_id and i.meter_id = m.id
        where m.organization_id = $1 and i.interval_start >= $2 and i.interval_start < $3
        group by m.code`,
      [org.id, SEEDED_FROM, new Date(throughBefore)],
    );
    const hours = (throughBefore - SEEDED_FROM.getTime()) / HOUR_MS;
    expect(rows).toHaveLength(installed.length);
    for (const r of rows) expect(r.measured, r.code).toBe(hours);
    const { silentMeters } =
      await import("../../app/overview/estate-overview.server");
    expect(await silentMeters(org.id, 2)).toEqual([]);
    expect((await storedCounts()).conflicts).toBe(0);

    // It stays up to post each hour as it ends, and stops on SIGTERM.
    await new Promise((r) => setTimeout(r, 1000));
    expect(feeder.child.exitCode).toBeNull();
    expect(await stop(feeder)).toBe(0);
  }, 90_000);

  it("sends nothing again on a second start: the server already has it all", async () => {
    const before = await storedCounts();
    const through = hourFloor(Date.now());
    const feeder = startFeeder();
    const [, posted] = await feeder.line(
      /up to date \(([\d,]+) readings posted\)/,
    );
    expect(await stop(feeder)).toBe(0);
    // Only an hour that ended in between goes, once.
    const newHours = (hourFloor(Date.now()) - through) / HOUR_MS;
    expect(Number(posted.replaceAll(",", ""))).toBe(
      newHours * installed.length,
    );
    const after = await storedCounts();
    expect(after.readings).toBe(before.readings + newHours * installed.length);
    expect(after.conflicts).toBe(0);
    if (newHours === 0) expect(after.batches).toBe(before.batches);
  }, 60_000);

  it("stops by itself when the script that started it is gone", async () => {
    const shell = watch(
      spawn(
        "bash",
        [
          "-c",
          `node --import tsx scripts/demo-feeder.ts "$0" & echo "feeder $!"; wait`,
          inject("baseUrl"),
        ],
        { env: feederEnv({}), stdio: ["ignore", "pipe", "pipe"] },
      ),
    );
    const [, pid] = await shell.line(/feeder (\d+)/);
    await shell.line(/up to date/);
    const alive = () => {
      try {
        process.kill(Number(pid), 0);
        return true;
      } catch {
        return false;
      }
    };
    expect(alive()).toBe(true);
    shell.child.kill("SIGKILL");
    const deadline = Date.now() + 15_000;
    while (alive() && Date.now() < deadline)
      await new Promise((r) => setTimeout(r, 200));
    expect(alive()).toBe(false);
  }, 60_000);
});
