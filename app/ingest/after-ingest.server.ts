/**
 * Work that follows a committed batch: estimates for gaps and quality flags.
 * It is derived data, so it runs after the acknowledgement, one meter at a
 * time, with ranges merged while a batch stream is arriving.
 */
import { estimateMeter } from "./estimate-meter.server";

type Range = { from: Date; to: Date };
const pending = new Map<
  string,
  { organizationId: string; meterId: string; range: Range }
>();
let running: Promise<void> | null = null;
let timer: NodeJS.Timeout | null = null;
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
  for (const [meterId, range] of touched) {
    const key = `${organizationId}|${meterId}`;
    const current = pending.get(key);
    pending.set(key, {
      organizationId,
      meterId,
      range: current
        ? {
            from:
              current.range.from < range.from ? current.range.from : range.from,
            to: current.range.to > range.to ? current.range.to : range.to,
          }
        : range,
    });
  }
  for (const listener of listeners)
    listener(organizationId, [...touched.keys()]);
  if (timer) clearTimeout(timer);
  timer = setTimeout(() => void drain(), SETTLE_MS);
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
      await estimateMeter(
        job.organizationId,
        job.meterId,
        job.range.from,
        job.range.to,
      ).catch((error: unknown) =>
        console.error("[estimate] meter", job.meterId, error),
      );
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
