/**
 * Work that follows a committed batch: estimates for gaps and quality flags.
 * It is derived data, so it runs after the acknowledgement, one meter at a
 * time, with ranges merged while a batch stream is arriving.
 */
import { estimateMeter } from "./estimate-meter.server";

import { isDatabaseUnavailable } from "~/db/availability.server";

type Range = { from: Date; to: Date };
interface PendingEstimate {
  organizationId: string;
  meterId: string;
  range: Range;
}
const pending = new Map<string, PendingEstimate>();
let running: Promise<void> | null = null;
let timer: NodeJS.Timeout | null = null;
let retryTimer: NodeJS.Timeout | null = null;

/** Adds a meter's range to the work, merged with what is already pending. */
function enqueue(key: string, job: PendingEstimate): void {
  const current = pending.get(key);
  pending.set(key, {
    ...job,
    range: current
      ? {
          from:
            current.range.from < job.range.from
              ? current.range.from
              : job.range.from,
          to: current.range.to > job.range.to ? current.range.to : job.range.to,
        }
      : job.range,
  });
}
const listeners = new Set<
  (organizationId: string, meterIds: string[]) => void
>();

/** Debounce: a stream of batches becomes one estimation pass per meter. */
const SETTLE_MS = 250;

export function afterIngest(
  organizationId: string,
  touched: Map<string, Range>,
): void {
  if (touched.size === 0) return;
  for (const [meterId, range] of touched)
    enqueue(`${organizationId}|${meterId}`, { organizationId, meterId, range });
  for (const listener of listeners)
    listener(organizationId, [...touched.keys()]);
  if (timer) clearTimeout(timer);
  timer = setTimeout(() => void drain(), SETTLE_MS);
}

const RETRY_AFTER_OUTAGE_MS = 5_000;

function requeue(key: string, job: PendingEstimate): void {
  enqueue(key, job);
  retryTimer ??= setTimeout(() => {
    retryTimer = null;
    void drain();
  }, RETRY_AFTER_OUTAGE_MS);
  retryTimer.unref();
}

async function drain(): Promise<void> {
  timer = null;
  if (running) {
    await running;
    if (pending.size) timer = setTimeout(() => void drain(), SETTLE_MS);
    return;
  }
  running = (async () => {
    while (pending.size > 0) {
      const [key, job] = pending.entries().next().value!;
      pending.delete(key);
      const outage = await estimateMeter(
        job.organizationId,
        job.meterId,
        job.range.from,
        job.range.to,
      ).then(
        () => false,
        (error: unknown) => {
          if (isDatabaseUnavailable(error)) return true;
          console.error("[estimate] meter", job.meterId, error);
          return false;
        },
      );
      // The database went away: keep the work and try again later rather
      // than leave the meter's gaps unestimated.
      if (outage) {
        requeue(key, job);
        break;
      }
    }
  })();
  await running;
  running = null;
}

/** Resolves when no estimation is pending or running (tests, seeding, shutdown). */
export async function estimationIdle(): Promise<void> {
  while (timer || running || pending.size) {
    if (timer) {
      clearTimeout(timer);
      await drain();
    } else if (running) await running;
    else await drain();
  }
}

/** Lets the readings page hear that a meter got new data. */
export function onIngest(
  listener: (organizationId: string, meterIds: string[]) => void,
): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}
