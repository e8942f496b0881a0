// Estimates for the missing intervals of one meter's series, at the meter's
// own resolution (15, 30 or 60 minutes: a gap is a run of missing intervals
// of that length). Short gaps are bridged in a straight line between the
// known intervals on either side; long gaps take the meter's own weekly
// shape (weekday × local interval of the day), because a straight line
// across several days would erase nights and weekends.

import { HOUR_MS, floorToStep } from "./hours";
import { weekSlot } from "./local-time";
import { knownPoints } from "./series";
import type { IntervalPoint } from "./series";

export interface EstimateOptions {
  /** The meter's interval length in ms (an hour if left out). */
  stepMs?: number;
  /** Gaps of at most this many hours are interpolated linearly. */
  shortGapMaxHours?: number;
  /** IANA zone of the site: occupancy follows local time, not UTC. */
  timeZone?: string;
  /** Weeks of history before the gap that make up the profile. */
  profileWeeks?: number;
}

export interface Estimate {
  intervalStart: Date;
  energyKwh: number;
  method: "linear" | "profile";
}

const WEEK_MS = 7 * 24 * HOUR_MS;

interface Anchor {
  t: number;
  value: number;
}

interface Resolved {
  stepMs: number;
  shortGapMaxHours: number;
  timeZone: string;
  profileWeeks: number;
}

function resolve(options: EstimateOptions): Resolved {
  const r = {
    stepMs: options.stepMs ?? HOUR_MS,
    shortGapMaxHours: options.shortGapMaxHours ?? 6,
    timeZone: options.timeZone ?? "UTC",
    profileWeeks: options.profileWeeks ?? 8,
  };
  if (!(r.shortGapMaxHours >= 0)) {
    throw new RangeError("shortGapMaxHours must be 0 or more");
  }
  if (!(r.stepMs > 0) || HOUR_MS % r.stepMs !== 0) {
    throw new RangeError("stepMs must divide an hour");
  }
  if (!(r.profileWeeks > 0)) {
    throw new RangeError("profileWeeks must be greater than 0");
  }
  return r;
}

// One anchor per interval; if a series repeats an interval, the later entry
// wins (a re-sent reading replaces the earlier one).
function anchorsOf(series: readonly IntervalPoint[], stepMs: number): Anchor[] {
  const byHour = new Map<number, number>();
  for (const p of knownPoints(series)) {
    byHour.set(floorToStep(p.intervalStart, stepMs).getTime(), p.energyKwh);
  }
  return [...byHour.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([t, value]) => ({ t, value }));
}

/** Straight line between two known intervals, at k of the n missing ones. */
export function interpolate(a: number, b: number, k: number, n: number) {
  return a + ((b - a) * k) / (n + 1);
}

/** Weekly profile: mean value per weekday × local interval of the day. */
class Profiles {
  private slots: number[] | undefined;

  constructor(
    private readonly anchors: readonly Anchor[],
    private readonly o: Resolved,
  ) {}

  // Local slots cost an Intl call each: computed once, and only when a long
  // gap needs them.
  private slotOf(i: number): number {
    this.slots ??= this.anchors.map((a) => this.slotAt(a.t));
    return this.slots[i];
  }

  means(fromT: number, toT: number): (number | undefined)[] {
    const slots = (7 * 24 * HOUR_MS) / this.o.stepMs;
    const sum = new Array<number>(slots).fill(0);
    const count = new Array<number>(slots).fill(0);
    for (let i = 0; i < this.anchors.length; i++) {
      const t = this.anchors[i].t;
      if (t < fromT || t >= toT) continue;
      sum[this.slotOf(i)] += this.anchors[i].value;
      count[this.slotOf(i)] += 1;
    }
    return sum.map((s, i) => (count[i] > 0 ? s / count[i] : undefined));
  }

  slotAt(t: number): number {
    return weekSlot(new Date(t), this.o.timeZone, this.o.stepMs / 60_000);
  }
}

function fillShort(
  a: Anchor,
  b: Anchor,
  n: number,
  stepMs: number,
): Estimate[] {
  const out: Estimate[] = [];
  for (let k = 1; k <= n; k++) {
    out.push({
      intervalStart: new Date(a.t + k * stepMs),
      energyKwh: interpolate(a.value, b.value, k, n),
      method: "linear",
    });
  }
  return out;
}

// Profile of the weeks before the gap; a slot with no data there falls back
// to the whole series, and a slot never seen at all to the straight line.
function fillLong(
  a: Anchor,
  b: Anchor,
  n: number,
  profiles: Profiles,
  o: Resolved,
): Estimate[] {
  const gapStart = a.t + o.stepMs;
  const recent = profiles.means(gapStart - o.profileWeeks * WEEK_MS, gapStart);
  let overall: (number | undefined)[] | undefined;
  const out: Estimate[] = [];
  for (let k = 1; k <= n; k++) {
    const t = a.t + k * o.stepMs;
    const slot = profiles.slotAt(t);
    let value = recent[slot];
    if (value === undefined) {
      overall ??= profiles.means(-Infinity, Infinity);
      value = overall[slot];
    }
    out.push(
      value === undefined
        ? {
            intervalStart: new Date(t),
            energyKwh: interpolate(a.value, b.value, k, n),
            method: "linear",
          }
        : { intervalStart: new Date(t), energyKwh: value, method: "profile" },
    );
  }
  return out;
}

/**
 * Estimates every interval strictly between the first and the last known
 * one (measured or edited) that has no known value, at the meter's
 * resolution (`stepMs`). Known intervals are never estimated over; intervals
 * after the last known one are left alone, since a silent meter may yet
 * send them. Known intervals also anchor the straight lines and make up the
 * profile: an edited value is a person's correction of a measurement and is
 * the better number for that interval. A short gap is one of at most
 * `shortGapMaxHours` hours, whatever the resolution.
 */
export function estimateGaps(
  series: readonly IntervalPoint[],
  options: EstimateOptions = {},
): Estimate[] {
  const o = resolve(options);
  const anchors = anchorsOf(series, o.stepMs);
  const shortGapMax = Math.floor((o.shortGapMaxHours * HOUR_MS) / o.stepMs);
  const profiles = new Profiles(anchors, o);
  const out: Estimate[] = [];
  for (let i = 1; i < anchors.length; i++) {
    const a = anchors[i - 1];
    const b = anchors[i];
    const n = Math.round((b.t - a.t) / o.stepMs) - 1;
    if (n < 1) continue;
    const filled =
      n <= shortGapMax
        ? fillShort(a, b, n, o.stepMs)
        : fillLong(a, b, n, profiles, o);
    // A loop, not push(...filled): a gap of months would exceed the
    // engine's argument limit.
    for (const e of filled) out.push(e);
  }
  return out;
}
