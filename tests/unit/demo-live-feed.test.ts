/**
 * The live demo's feed and its gateway client, with a clock, a server and a
 * database of the test's own (the integration test runs the real ones).
 */
import { isGasRegister } from "../../seeds/scenario/gas-supplies";
import { describe, expect, it } from "vitest";
import { LiveFeed, type StoredUntil } from "../../seeds/live/feed";
import { FeedRefused, gatewayPoster } from "../../seeds/live/gateway-poster";
import {
  generateReadings,
  type GatewayReading,
} from "../../seeds/scenario/generate";
import { METERS } from "../../seeds/scenario/larchmere-estate";

const HOUR_MS = 3_600_000;
const plus = (d: Date, ms: number) => new Date(d.getTime() + ms);
const installed = METERS.filter((m) => !m.removedAt);
const isRegisterMeter = (code: string) =>
  METERS.find((m) => m.code === code)?.quantity === "electric_register" ||
  isGasRegister(code);

/** The seeded data ends at `end`: each interval meter's last hour starts an hour before, each register reads at it. */
function storedThrough(end: Date): Map<string, Date | null> {
  return new Map(
    installed.map((m) => [
      m.code,
      isRegisterMeter(m.code) ? end : plus(end, -HOUR_MS),
    ]),
  );
}

const keyOf = (r: GatewayReading) =>
  `${r.meter}@${"time" in r ? r.time : r.start}`;
const byKey = (rs: GatewayReading[]) =>
  [...rs].sort((a, b) => keyOf(a).localeCompare(keyOf(b)));

function fakeFeed(stored: StoredUntil, start: Date, batchSize = 5000) {
  const batches: GatewayReading[][] = [];
  const clock = { now: start };
  const feed = new LiveFeed({
    storedUntil: async () => stored,
    post: async (readings) => {
      batches.push(readings);
    },
    now: () => clock.now,
    log: () => {},
    batchSize,
  });
  const posted = () => batches.flat();
  return { feed, batches, clock, posted };
}

// Three days after the data ends, twenty minutes into an hour.
const END = new Date("2026-12-01T00:00:00Z");
const NOW = new Date("2026-12-04T09:20:00Z");
const LAST_FULL_HOUR = new Date("2026-12-04T09:00:00Z");

describe("the live demo feed", () => {
  it("backfills every meter from its newest stored reading to the last hour that ended, in batches", async () => {
    const { feed, batches, posted } = fakeFeed(storedThrough(END), NOW, 700);
    const count = await feed.start();
    const expected = [...generateReadings({ from: END, to: LAST_FULL_HOUR })]
      .map((r) => r.reading)
      // The registers' reads at END are stored already.
      .filter((r) => !("time" in r && r.time === "2026-12-01T00:00:00Z"));
    expect(byKey(posted())).toEqual(byKey(expected));
    expect(count).toBe(expected.length);
    // Three days and nine hours of 18 installed meters.
    expect(count).toBe(81 * installed.length);
    expect(batches.length).toBe(Math.ceil(expected.length / 700));
    expect(batches.every((b) => b.length <= 700)).toBe(true);
  }, 30_000);

  it("takes each meter from its own newest reading: one further behind gets its older hours too", async () => {
    const stored = storedThrough(END);
    stored.set("RL-HX1", new Date("2026-11-30T18:00:00Z"));
    const { feed, posted } = fakeFeed(stored, NOW);
    await feed.start();
    const library = posted().filter((r) => r.meter === "RL-HX1");
    expect(library.map(keyOf)[0]).toBe("RL-HX1@2026-11-30T19:00:00Z");
    expect(library).toHaveLength(5 + 81);
    // Nobody else is sent an hour they have.
    const others = posted().filter((r) => r.meter !== "RL-HX1");
    expect(others.every((r) => keyOf(r) > `${r.meter}@2026-12-01T00`)).toBe(
      true,
    );
    expect(
      others.some((r) => keyOf(r) === `${r.meter}@2026-12-01T00:00:00Z`),
    ).toBe(true);
  }, 30_000);

  it("posts each hour once it has ended, and nothing while it runs", async () => {
    const { feed, clock, posted } = fakeFeed(storedThrough(END), NOW);
    const backfill = await feed.start();
    clock.now = new Date("2026-12-04T09:59:59Z");
    expect(await feed.tick()).toBe(0);
    clock.now = new Date("2026-12-04T10:00:05Z");
    const hour = await feed.tick();
    const newHour = posted().slice(backfill!);
    expect(hour).toBe(installed.length);
    for (const r of newHour) {
      expect(keyOf(r)).toBe(
        isRegisterMeter(r.meter)
          ? `${r.meter}@2026-12-04T10:00:00Z`
          : `${r.meter}@2026-12-04T09:00:00Z`,
      );
    }
    // The same readings the seed would have made for that hour.
    const seeded = [
      ...generateReadings({
        from: LAST_FULL_HOUR,
        to: plus(LAST_FULL_HOUR, HOUR_MS),
      }),
    ]
      .map((r) => r.reading)
      .filter((r) => !("time" in r && r.time === "2026-12-04T09:00:00Z"));
    expect(newHour).toEqual(seeded);
    // Two hours later (say, the machine slept), both hours go.
    clock.now = new Date("2026-12-04T12:00:01Z");
    expect(await feed.tick()).toBe(2 * installed.length);
  }, 30_000);

  it("sends nothing on a second start when the server is up to date", async () => {
    const stored = new Map(
      installed.map((m) => [
        m.code,
        isRegisterMeter(m.code)
          ? LAST_FULL_HOUR
          : plus(LAST_FULL_HOUR, -HOUR_MS),
      ]),
    );
    const { feed, posted } = fakeFeed(stored, NOW);
    expect(await feed.start()).toBe(0);
    expect(posted()).toEqual([]);
  }, 30_000);

  it("feeds nothing where the key has no demo estate", async () => {
    const { feed, posted } = fakeFeed(new Map(), NOW);
    expect(await feed.start()).toBeNull();
    expect(posted()).toEqual([]);
  });
});

/** A server that answers from a list, recording what it got and when. */
function fakeServer(answers: (Response | Error)[]) {
  let t = 0;
  const calls: { at: number; body: { readings: unknown[] } }[] = [];
  const waits: number[] = [];
  const fetch = (async (_url: string, init: RequestInit) => {
    calls.push({ at: t, body: JSON.parse(String(init.body)) });
    const next = answers.shift();
    if (!next) throw new Error("no more answers");
    if (next instanceof Error) throw next;
    return next;
  }) as typeof globalThis.fetch;
  const sleep = async (ms: number) => {
    waits.push(ms);
    t += ms;
  };
  return { fetch, sleep, now: () => t, calls, waits };
}

const ok = () =>
  Response.json({ accepted: 1, repeats: 0, rejected: [], conflicts: [] });
const reading = {
  meter: "CH-EL1",
  quantity: "electric_register",
  time: "2026-12-01T01:00:00Z",
  register_kwh: 1,
} as const;

function poster(server: ReturnType<typeof fakeServer>, perMinute = 600) {
  const logs: string[] = [];
  const post = gatewayPoster({
    baseUrl: "http://server.test",
    key: "jbgw_test",
    perMinute,
    signal: new AbortController().signal,
    log: (m) => logs.push(m),
    fetch: server.fetch,
    sleep: server.sleep,
    now: server.now,
  });
  return { post, logs };
}

describe("the demo gateway's client", () => {
  it("spaces batches to stay under the gateway rate limit", async () => {
    const server = fakeServer([ok(), ok(), ok()]);
    const { post } = poster(server, 120);
    for (let i = 0; i < 3; i++) await post([reading]);
    expect(server.calls.map((c) => c.at)).toEqual([0, 500, 1000]);
  });

  it("waits as Retry-After says on 429 and 503, then sends the same batch again", async () => {
    const server = fakeServer([
      new Response("{}", { status: 429, headers: { "retry-after": "7" } }),
      new Response("{}", { status: 503, headers: { "retry-after": "5" } }),
      ok(),
    ]);
    const { post } = poster(server);
    await post([reading]);
    expect(server.calls).toHaveLength(3);
    expect(server.calls.every((c) => c.body.readings.length === 1)).toBe(true);
    expect(server.waits.filter((ms) => ms >= 1000)).toEqual([7000, 5000]);
  });

  it("sends again after a network failure", async () => {
    const server = fakeServer([new TypeError("fetch failed"), ok()]);
    const { post } = poster(server);
    await post([reading]);
    expect(server.calls).toHaveLength(2);
  });

  it("gives up with the server's words when the key is refused", async () => {
    const server = fakeServer([
      Response.json(
        {
          error: {
            code: "invalid_key",
            message: "The API key is unknown or revoked.",
          },
        },
        { status: 401 },
      ),
    ]);
    const { post } = poster(server);
    await expect(post([reading])).rejects.toThrow(FeedRefused);
    expect(server.calls).toHaveLength(1);
  });

  it("says which readings the server rejected", async () => {
    const server = fakeServer([
      Response.json({
        accepted: 0,
        repeats: 0,
        rejected: [{ index: 0, meter: "CH-EL1", reason: "not installed then" }],
        conflicts: [],
      }),
    ]);
    const { post, logs } = poster(server);
    await post([reading]);
    expect(logs).toEqual([
      "1 of 1 readings rejected, e.g. CH-EL1: not installed then",
    ]);
  });
});
