/**
 * The live demo's gateway: `npm start` runs it beside the server (unless
 * DEMO_LIVE=0). Once the server answers, it posts the Larchmere estate's
 * readings from where each demo meter's stored readings end up to the last
 * hour that has ended, then each hour as it ends, through POST
 * /api/v1/readings with the demo gateway key. It stops on SIGTERM or SIGINT,
 * and by itself when the script that started it is gone.
 *
 *   node --import tsx scripts/demo-feeder.ts [baseUrl]
 *
 * baseUrl defaults to the server of HOST and PORT. It reads the database
 * (DATABASE_URL) only to learn where the stored readings end.
 */
import { setTimeout as sleep } from "node:timers/promises";
import pg from "pg";
import { parseEnv, type Env } from "../app/env.server";
import { DEFAULT_DEMO_GATEWAY_KEY } from "../seeds/demo-people";
import { LiveFeed } from "../seeds/live/feed";
import { formatCount } from "../app/lib/format";
import { FeedRefused, gatewayPoster } from "../seeds/live/gateway-poster";
import { storedUntil } from "../seeds/live/stored-until";

/** How often the feed looks whether an hour has ended. */
const TICK_MS = 30_000;
/** How long to wait for the server to answer its health check at start. */
const SERVER_START_MS = 120_000;

const log = (message: string) => console.log(`[demo-feed] ${message}`);

function loadEnv(): Env {
  try {
    return parseEnv(process.env);
  } catch (error) {
    console.error((error as Error).message);
    process.exit(1);
  }
}

function serverUrl(env: Env): string {
  const host = env.HOST === "0.0.0.0" ? "127.0.0.1" : env.HOST;
  return process.argv[2] ?? `http://${host}:${env.PORT}`;
}

/** Stops on a signal, or when the parent (start.sh) has gone without one. */
function stopSignal(): AbortSignal {
  const controller = new AbortController();
  const stop = () => controller.abort();
  process.once("SIGTERM", stop);
  process.once("SIGINT", stop);
  const parent = process.ppid;
  setInterval(() => {
    if (process.ppid !== parent) stop();
  }, 2_000).unref();
  return controller.signal;
}

async function waitForServer(baseUrl: string, signal: AbortSignal) {
  const deadline = Date.now() + SERVER_START_MS;
  while (Date.now() < deadline) {
    try {
      const response = await fetch(`${baseUrl}/api/v1/health`, { signal });
      if (response.ok) return;
    } catch {
      if (signal.aborted) throw signal.reason;
    }
    await sleep(500, undefined, { signal });
  }
  throw new FeedRefused(`the server at ${baseUrl} did not answer in time`);
}

async function main(): Promise<number> {
  const env = loadEnv();
  if (env.DEMO_LIVE === "0") {
    log("off (DEMO_LIVE=0): the demo's readings stay as they are");
    return 0;
  }
  const signal = stopSignal();
  const baseUrl = serverUrl(env);
  const key = env.DEMO_GATEWAY_KEY ?? DEFAULT_DEMO_GATEWAY_KEY;
  await waitForServer(baseUrl, signal);

  const pool = new pg.Pool({ connectionString: env.DATABASE_URL, max: 1 });
  const feed = new LiveFeed({
    storedUntil: () => storedUntil(pool, key),
    post: gatewayPoster({
      baseUrl,
      key,
      perMinute: env.GATEWAY_RATE_LIMIT_PER_MINUTE,
      signal,
      log,
    }),
    now: () => new Date(),
    log,
  });
  const backfilled = await feed.start().finally(() => pool.end());
  if (backfilled === null) {
    log("no demo estate belongs to the demo gateway key: nothing to feed");
    return 0;
  }
  log(
    `up to date (${formatCount(backfilled)} readings posted); posting each hour as it ends`,
  );
  while (!signal.aborted) {
    await sleep(TICK_MS, undefined, { signal });
    const posted = await feed.tick();
    if (posted > 0) log(`posted the hour just ended: ${posted} readings`);
  }
  return 0;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    if ((error as Error).name === "AbortError") process.exit(0);
    console.error(
      `[demo-feed] stopped: ${error instanceof FeedRefused ? error.message : String((error as Error).stack ?? error)}`,
    );
    process.exit(1);
  },
);
