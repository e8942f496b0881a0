/**
 * Posts batches to POST /api/v1/readings as a well-behaved gateway does:
 * spaced to stay under the server's per-gateway rate limit, waiting as told
 * by Retry-After on 429 and 503, and sending a batch again after a network
 * failure (the ingest API's idempotency makes a repeat harmless).
 */
import { setTimeout as sleep } from "node:timers/promises";
import type { GatewayReading } from "../scenario/generate";

/** The server refused in a way that waiting will not mend (a revoked key, a bad batch). */
export class FeedRefused extends Error {}

export interface PosterOptions {
  baseUrl: string;
  /** The gateway key, sent as `Authorization: Bearer`. */
  key: string;
  /** The server's GATEWAY_RATE_LIMIT_PER_MINUTE. */
  perMinute: number;
  signal: AbortSignal;
  log(message: string): void;
  /** How long the server may stay unreachable before the poster gives up. */
  unreachableForMs?: number;
  fetch?: typeof fetch;
  sleep?: (ms: number, signal: AbortSignal) => Promise<void>;
  now?: () => number;
}

interface BatchAnswer {
  accepted: number;
  repeats: number;
  rejected: { index: number; meter?: string; reason: string }[];
  conflicts: unknown[];
  error?: { message?: string };
}

const RETRY_SERVER_ERROR_MS = 5_000;
const MAX_SERVER_ERRORS = 5;
const RETRY_UNREACHABLE_MS = 2_000;

function retryAfterMs(response: Response, fallbackS: number): number {
  const seconds = Number(response.headers.get("retry-after"));
  return (Number.isFinite(seconds) && seconds > 0 ? seconds : fallbackS) * 1000;
}

export function gatewayPoster(options: PosterOptions) {
  const doFetch = options.fetch ?? fetch;
  const wait =
    options.sleep ??
    ((ms: number, signal: AbortSignal) => sleep(ms, undefined, { signal }));
  const now = options.now ?? (() => performance.now());
  const unreachableFor = options.unreachableForMs ?? 60_000;
  // Batches start at least this far apart, so the feed alone never meets
  // the limit; a 429 (another client on the same key) still waits.
  const spacingMs = Math.ceil(60_000 / options.perMinute);
  let lastStart = -Infinity;

  async function send(readings: GatewayReading[]): Promise<Response> {
    const gap = lastStart + spacingMs - now();
    if (gap > 0) await wait(gap, options.signal);
    lastStart = now();
    return doFetch(`${options.baseUrl}/api/v1/readings`, {
      method: "POST",
      headers: {
        authorization: `Bearer ${options.key}`,
        "content-type": "application/json",
      },
      body: JSON.stringify({ readings }),
      signal: options.signal,
    });
  }

  return async function post(readings: GatewayReading[]): Promise<void> {
    let serverErrors = 0;
    let unreachableSince: number | null = null;
    for (;;) {
      let response: Response;
      try {
        response = await send(readings);
      } catch (error) {
        if (options.signal.aborted) throw error;
        unreachableSince ??= now();
        if (now() - unreachableSince > unreachableFor)
          throw new FeedRefused(
            `the server at ${options.baseUrl} has not answered for ${Math.round(unreachableFor / 1000)} s (${(error as Error).message})`,
          );
        await wait(RETRY_UNREACHABLE_MS, options.signal);
        continue;
      }
      unreachableSince = null;
      if (response.ok) {
        report(options, (await response.json()) as BatchAnswer, readings);
        return;
      }
      const body = (await response.json().catch(() => ({}))) as BatchAnswer;
      if (response.status === 429 || response.status === 503) {
        const ms = retryAfterMs(response, response.status === 429 ? 60 : 5);
        options.log(
          `the server answered ${response.status}; sending the batch again in ${Math.round(ms / 1000)} s`,
        );
        await wait(ms, options.signal);
        continue;
      }
      if (response.status >= 500 && ++serverErrors < MAX_SERVER_ERRORS) {
        await wait(RETRY_SERVER_ERROR_MS, options.signal);
        continue;
      }
      throw new FeedRefused(
        `the server refused a batch with ${response.status}: ${body.error?.message ?? "no message"}`,
      );
    }
  };
}

/** Repeats are expected (a restart sends an hour again); anything refused is said. */
function report(
  options: PosterOptions,
  answer: BatchAnswer,
  readings: GatewayReading[],
): void {
  const { rejected, conflicts } = answer;
  if (rejected.length > 0) {
    const first = rejected[0];
    options.log(
      `${rejected.length} of ${readings.length} readings rejected, e.g. ${first.meter ?? readings[first.index]?.meter}: ${first.reason}`,
    );
  }
  if (conflicts.length > 0)
    options.log(
      `${conflicts.length} readings differ from ones already stored (kept for review, not applied)`,
    );
}
