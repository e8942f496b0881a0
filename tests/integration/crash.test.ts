/**
 * Crash test of the readings ingest: a production server of its own is
 * SIGKILLed while a gateway client has batches in flight, then restarted on
 * the same port. Whatever was acknowledged must be stored exactly once,
 * nothing may be half-stored, re-sending must be harmless, and the intervals
 * must add up to the raw readings to the last digit.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { pool } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";
import { freePort, ServerProcess } from "../support/server-process";

const READINGS_PER_BATCH = 200;
/** At most this many batches are ever planned: 250 × 200 h ends in 2025-09. */
const MAX_BATCHES = 250;
const CONCURRENT_CLIENTS = 4;
const KILL_AFTER_MS = 1_500;
/** The kill waits for a first acknowledgement, but not for ever. */
const FIRST_ACK_DEADLINE_MS = 20_000;
const REQUEST_TIMEOUT_MS = 30_000;
const RESEND_ATTEMPTS = 5;
const FIRST_HOUR = Date.parse("2020-01-01T00:00:00Z");
const HOUR_MS = 3_600_000;

interface IngestAnswer {
  batch_id: string;
  accepted: number;
  repeats: number;
  rejected: unknown[];
  conflicts: unknown[];
}

interface Batch {
  index: number;
  body: string;
  /** reading_time of each reading, ISO. */
  times: string[];
  sent: boolean;
  ack: IngestAnswer | null;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Batch k: water-heat hourly readings for hours [200k, 200k + 200) after 2020-01-01. */
function makeBatch(meterCode: string, index: number): Batch {
  const readings = [];
  const times: string[] = [];
  for (let i = 0; i < READINGS_PER_BATCH; i++) {
    const n = index * READINGS_PER_BATCH + i;
    const start = new Date(FIRST_HOUR + n * HOUR_MS).toISOString();
    times.push(start);
    readings.push({
      meter: meterCode,
      quantity: "water_heat",
      start,
      end: new Date(FIRST_HOUR + (n + 1) * HOUR_MS).toISOString(),
      // 1.000–2.999 m³; the meter supplies sensor position and pressure.
      volume_m3: 1 + ((n * 7919) % 2000) / 1000,
      flow_temp_c: 70,
      return_temp_c: 45,
    });
  }
  return {
    index,
    body: JSON.stringify({ readings }),
    times,
    sent: false,
    ack: null,
  };
}

async function post(
  baseUrl: string,
  key: string,
  batch: Batch,
  signal?: AbortSignal,
): Promise<{ status: number; answer: IngestAnswer | null }> {
  const timeout = AbortSignal.timeout(REQUEST_TIMEOUT_MS);
  const response = await fetch(`${baseUrl}/api/v1/readings`, {
    method: "POST",
    headers: {
      "content-type": "application/json",
      authorization: `Bearer ${key}`,
    },
    body: batch.body,
    signal: signal ? AbortSignal.any([signal, timeout]) : timeout,
  });
  const text = await response.text();
  return {
    status: response.status,
    answer: response.ok ? (JSON.parse(text) as IngestAnswer) : null,
  };
}

/** Re-sends after the restart: network errors (stale pooled sockets) are retried. */
async function resend(
  baseUrl: string,
  key: string,
  batch: Batch,
): Promise<IngestAnswer> {
  let lastError: unknown = null;
  for (let attempt = 0; attempt < RESEND_ATTEMPTS; attempt++) {
    try {
      const { status, answer } = await post(baseUrl, key, batch);
      if (status === 200 && answer) return answer;
      lastError = new Error(`batch ${batch.index}: HTTP ${status}`);
    } catch (error) {
      lastError = error;
    }
    await sleep(200);
  }
  throw lastError;
}

describe("readings ingest survives a SIGKILL mid-flight", () => {
  let server: ServerProcess | null = null;
  let org: MeteredOrg;

  beforeAll(async () => {
    org = await createMeteredOrg();
    server = new ServerProcess(await freePort(), {
      GATEWAY_RATE_LIMIT_PER_MINUTE: "100000",
    });
    await server.start();
  });

  afterAll(async () => {
    try {
      await server?.stop("SIGKILL");
    } finally {
      await pool.end();
    }
  });

  it("stores every acknowledged reading exactly once and nothing half", async () => {
    if (!server) throw new Error("no server");
    const srv = server;
    const key = org.gatewayKey;
    const meter = org.meters.water;
    const batches: Batch[] = [];
    let killed = false;
    let inFlight = 0;
    let inFlightAtKill = -1;
    const clientAbort = new AbortController();

    // Each client takes the next batch and posts it, until the server is
    // killed or the plan runs out.
    const client = async () => {
      while (!killed && batches.length < MAX_BATCHES) {
        const batch = makeBatch(meter.code, batches.length);
        batches.push(batch);
        batch.sent = true;
        inFlight++;
        try {
          const { status, answer } = await post(
            srv.baseUrl,
            key,
            batch,
            clientAbort.signal,
          );
          if (status === 200 && answer) batch.ack = answer;
          else if (!killed)
            throw new Error(`batch ${batch.index}: HTTP ${status}`);
        } catch (error) {
          // After the kill, connection errors are what we came for.
          if (!killed) throw error;
        } finally {
          inFlight--;
        }
      }
    };

    const started = Date.now();
    const settled = Promise.allSettled(
      Array.from({ length: CONCURRENT_CLIENTS }, client),
    );
    const killer = (async () => {
      while (Date.now() - started < FIRST_ACK_DEADLINE_MS) {
        const acked = batches.some((b) => b.ack);
        if (Date.now() - started >= KILL_AFTER_MS && acked) break;
        await sleep(10);
      }
      inFlightAtKill = inFlight;
      killed = true;
      srv.child?.kill("SIGKILL");
    })();
    await killer;
    // Anything the dead server still had buffered is read; hung sockets are cut.
    const late = await Promise.race([
      settled.then(() => false),
      sleep(5_000).then(() => true),
    ]);
    if (late) {
      clientAbort.abort();
      await settled;
    }
    for (const outcome of await settled) {
      if (outcome.status === "rejected") throw outcome.reason;
    }
    await srv.stop("SIGKILL");

    const acked = batches.filter((b) => b.ack);
    const unacked = batches.filter((b) => !b.ack);
    console.log(
      `[crash] before the kill: ${batches.length} batches sent, ${acked.length} acknowledged, ${inFlightAtKill} in flight at the kill`,
    );
    expect(acked.length).toBeGreaterThan(0);
    expect(inFlightAtKill).toBeGreaterThan(0);
    for (const b of acked) {
      expect(b.ack).toMatchObject({
        accepted: READINGS_PER_BATCH,
        repeats: 0,
        rejected: [],
        conflicts: [],
      });
    }

    await srv.start();

    // Every unacknowledged batch again, plus a few acknowledged ones.
    const resendAcked = [
      acked[0],
      acked[Math.floor(acked.length / 2)],
      acked[acked.length - 1],
    ].filter((b, i, all) => all.indexOf(b) === i);
    const queue = [...unacked, ...resendAcked];
    const answers = new Map<Batch, IngestAnswer>();
    const resender = async () => {
      for (let b = queue.shift(); b; b = queue.shift()) {
        answers.set(b, await resend(srv.baseUrl, key, b));
      }
    };
    await Promise.all(Array.from({ length: CONCURRENT_CLIENTS }, resender));

    let committedButUnacked = 0;
    for (const b of unacked) {
      const answer = answers.get(b)!;
      expect(answer.rejected).toEqual([]);
      expect(answer.conflicts).toEqual([]);
      expect(answer.accepted + answer.repeats).toBe(READINGS_PER_BATCH);
      // All or nothing: a batch is either wholly new or wholly a repeat.
      expect([0, READINGS_PER_BATCH]).toContain(answer.repeats);
      if (answer.repeats > 0) committedButUnacked++;
    }
    for (const b of resendAcked) {
      expect(answers.get(b)).toMatchObject({
        accepted: 0,
        repeats: READINGS_PER_BATCH,
        rejected: [],
        conflicts: [],
      });
    }
    console.log(
      `[crash] re-sent ${unacked.length} unacknowledged (${committedButUnacked} had committed before the kill) and ${resendAcked.length} acknowledged batches`,
    );

    const orgId = org.org.id;
    const sentCount = batches.length * READINGS_PER_BATCH;

    // Exactly once per (meter, reading time), and nothing besides what was sent.
    const { rows: counts } = await pool.query<{
      rows: string;
      keys: string;
      max_per_key: string;
    }>(
      `select count(*) as rows,
              count(distinct (meter_id, reading_time)) as keys,
              coalesce(max(n), 0) as max_per_key
         from (select meter_id, reading_time, count(*) over (partition by meter_id, reading_time) as n
                 from raw_readings where organization_id = $1) r`,
      [orgId],
    );
    expect(Number(counts[0].max_per_key)).toBe(1);
    expect(Number(counts[0].rows)).toBe(sentCount);
    expect(Number(counts[0].keys)).toBe(sentCount);

    // Every acknowledged reading is there.
    const ackedTimes = acked.flatMap((b) => b.times);
    const { rows: present } = await pool.query<{ n: string }>(
      `select count(*) as n from raw_readings r
         join unnest($3::timestamptz[]) as u(t) on r.reading_time = u.t
        where r.organization_id = $1 and r.meter_id = $2`,
      [orgId, meter.id, ackedTimes],
    );
    expect(Number(present[0].n)).toBe(ackedTimes.length);

    // Each recorded batch holds exactly the rows it says it accepted; an
    // acknowledged batch id is among them with all its readings.
    const { rows: batchRows } = await pool.query<{
      id: string;
      accepted: number;
      stored: string;
    }>(
      `select b.id, b.accepted,
              (select count(*) from raw_readings r
                where r.organization_id = b.organization_id and r.batch_id = b.id) as stored
         from ingest_batches b where b.organization_id = $1`,
      [orgId],
    );
    const halfStored = batchRows.filter((b) => Number(b.stored) !== b.accepted);
    expect(halfStored).toEqual([]);
    const recorded = new Map(batchRows.map((b) => [b.id, b.accepted]));
    for (const b of acked)
      expect(recorded.get(b.ack!.batch_id)).toBe(READINGS_PER_BATCH);
    const storedByBatches = batchRows.reduce((s, b) => s + b.accepted, 0);
    expect(storedByBatches).toBe(sentCount);

    // The intervals add up to the raw energies, compared as numeric in SQL.
    const { rows: sums } = await pool.query<{
      raw_sum: string;
      interval_sum: string;
      equal: boolean;
      qualities: string;
    }>(
      `select r.s::text as raw_sum, i.s::text as interval_sum, r.s = i.s as equal, i.q as qualities
         from (select sum(energy_kwh) as s from raw_readings
                where organization_id = $1 and meter_id = $2) r,
              (select sum(energy_kwh) as s,
                      string_agg(distinct quality::text, ',') as q
                 from intervals where organization_id = $1 and meter_id = $2) i`,
      [orgId, meter.id],
    );
    expect(
      sums[0],
      `raw ${sums[0].raw_sum} vs intervals ${sums[0].interval_sum} (${sums[0].qualities})`,
    ).toMatchObject({ equal: true });
  }, 180_000);
});
