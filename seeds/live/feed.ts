/**
 * The live demo: the Larchmere estate's readings continued past the seeded
 * data, hour by hour, from the scenario's own run (same load models, same
 * weather), so the demo never goes silent. Plain logic: what to read from
 * the server, how to post and what time it is are given (scripts/demo-feeder.ts
 * gives the real ones, the tests their own).
 */
import { MAX_READINGS_PER_BATCH } from "../../app/ingest/reading-schema";
import { floorToHour, HOUR_MS } from "../../app/ingest/hours";
import { ScenarioRun } from "../scenario/generate";
import { SCENARIO_PERIOD } from "../scenario/larchmere-estate";
import type { GatewayReading, ScenarioReading } from "../scenario/generate";

/**
 * The demo meters the server keeps readings for, by code: the time of each
 * one's newest stored reading (an interval's start, a register read's
 * time), or null when it has none. Retired meters are left out.
 */
export type StoredUntil = ReadonlyMap<string, Date | null>;

export interface FeedDeps {
  /** Read once, when the feed starts; empty when there is no demo estate. */
  storedUntil(): Promise<StoredUntil>;
  /** Posts one batch; resolves once the server has stored it. */
  post(readings: GatewayReading[]): Promise<void>;
  now(): Date;
  log(message: string): void;
  /** At most this many readings per batch (the API's own limit by default). */
  batchSize?: number;
}

/** A meter without readings of its own starts this long before now. */
const FRESH_METER_HISTORY_MS = 24 * HOUR_MS;

function readingTime(reading: GatewayReading): number {
  return Date.parse("time" in reading ? reading.time : reading.start);
}

export class LiveFeed {
  private run: ScenarioRun | null = null;
  /** The codes of the meters fed (those the server has). */
  private meters = new Set<string>();

  constructor(private readonly deps: FeedDeps) {}

  /**
   * The backfill: every demo meter from its newest stored reading up to the
   * last hour that has ended. Returns the number of readings posted, or
   * null when the server has no demo estate to feed.
   */
  async start(): Promise<number | null> {
    const stored = await this.deps.storedUntil();
    if (stored.size === 0) return null;
    const through = floorToHour(this.deps.now());
    const after = resumeAfter(stored, through);
    this.meters = new Set(after.keys());
    const emitFrom = backfillStart(after, through);
    this.run = new ScenarioRun();
    const fresh = (r: ScenarioReading) =>
      after.has(r.meter) && readingTime(r.reading) > after.get(r.meter)!;
    const hours = (through.getTime() - emitFrom.getTime()) / HOUR_MS;
    if (hours > 0)
      this.deps.log(
        `backfilling ${hours} h, from ${emitFrom.toISOString()} to ${through.toISOString()}`,
      );
    return this.postAll(this.run.advance(through, emitFrom), fresh);
  }

  /**
   * Posts the hours that have ended since the last call (none while the
   * current hour runs). Returns the number of readings posted.
   */
  async tick(): Promise<number> {
    const run = this.run;
    if (!run) throw new Error("start the feed first");
    const through = floorToHour(this.deps.now());
    if (through <= run.position) return 0;
    const meters = this.meters;
    return this.postAll(run.advance(through, run.position), (r) =>
      meters.has(r.meter),
    );
  }

  private async postAll(
    readings: Iterable<ScenarioReading>,
    wanted: (r: ScenarioReading) => boolean,
  ): Promise<number> {
    const size = this.deps.batchSize ?? MAX_READINGS_PER_BATCH;
    let batch: GatewayReading[] = [];
    let count = 0;
    for (const r of readings) {
      if (!wanted(r)) continue;
      batch.push(r.reading);
      if (batch.length < size) continue;
      await this.deps.post(batch);
      count += batch.length;
      batch = [];
    }
    if (batch.length > 0) {
      await this.deps.post(batch);
      count += batch.length;
    }
    return count;
  }
}

/** The whole hour the backfill starts at: within the scenario, not after now. */
function backfillStart(after: Map<string, number>, through: Date): Date {
  const oldest = floorToHour(new Date(Math.min(...after.values()))).getTime();
  return new Date(
    Math.min(
      Math.max(oldest, SCENARIO_PERIOD.from.getTime()),
      through.getTime(),
    ),
  );
}

/**
 * Per meter, the instant after which its readings are new: its newest stored
 * reading; for a meter with none, the oldest of the others (or a day ago
 * when no meter has any), so it joins the backfill.
 */
function resumeAfter(stored: StoredUntil, through: Date): Map<string, number> {
  const known = [...stored.values()]
    .filter((d): d is Date => d !== null)
    .map((d) => d.getTime());
  const fallback = known.length
    ? Math.min(...known)
    : through.getTime() - FRESH_METER_HISTORY_MS;
  return new Map(
    [...stored].map(([code, at]) => [code, at?.getTime() ?? fallback]),
  );
}
