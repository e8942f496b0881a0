/**
 * What every part of the fake shares: the state, the clock, the base URL of
 * its pages, and event emission. The clock is real time plus an offset that
 * `/_fake/advance` moves forward, so tests cross billing periods at once.
 */
import { StripeFakeError, notFound } from "./errors";
import {
  collectionFor,
  type ApiList,
  type Interval,
  type State,
} from "./store";
import type { EventDraft, WebhookBus } from "./webhooks";

export interface Ctx {
  state: State;
  bus: WebhookBus;
  now(): number;
  baseUrl(): string;
  emit(type: string, object: { id: string }): void;
  /** Runs fn and hands back the events it emitted instead of publishing
   * them, so a caller can publish its own summary event first. */
  capture(fn: () => void): EventDraft[];
  publish(drafts: EventDraft[]): void;
}

export function createContext(
  state: State,
  bus: WebhookBus,
  baseUrl: () => string,
): Ctx {
  let sink: EventDraft[] | null = null;
  const ctx: Ctx = {
    state,
    bus,
    baseUrl,
    now: () => Math.floor(Date.now() / 1000) + state.clockOffset,
    emit(type, object) {
      ctx.publish([bus.draft(type, object, ctx.now())]);
    },
    capture(fn) {
      const outer = sink;
      const mine: EventDraft[] = [];
      sink = mine;
      try {
        fn();
      } finally {
        sink = outer;
      }
      return mine;
    },
    publish(drafts) {
      for (const draft of drafts) {
        if (sink) sink.push(draft);
        else bus.publish(draft);
      }
    },
  };
  return ctx;
}

/** Looks an object up by id in the collection its prefix names, or 404s. */
export function mustFind<T extends { id: string }>(
  list: T[],
  id: string,
  kind: string,
  param = "id",
): T {
  const found = list.find((o) => o.id === id);
  if (!found) throw notFound(kind, id, param);
  return found;
}

/** Calendar arithmetic in UTC; a month from 31 January is 28/29 February. */
export function addInterval(
  unix: number,
  interval: Interval,
  count: number,
): number {
  if (interval === "day") return unix + count * 86_400;
  if (interval === "week") return unix + count * 7 * 86_400;
  const months = interval === "year" ? 12 * count : count;
  const d = new Date(unix * 1000);
  const year = d.getUTCFullYear();
  const month = d.getUTCMonth() + months;
  const lastDay = new Date(Date.UTC(year, month + 1, 0)).getUTCDate();
  const day = Math.min(d.getUTCDate(), lastDay);
  const time = [d.getUTCHours(), d.getUTCMinutes(), d.getUTCSeconds()] as const;
  return Date.UTC(year, month, day, ...time) / 1000;
}

/** The first period boundary after `after`, counted from the anchor so that
 * short months do not drift the billing day. */
export function nextPeriodEnd(
  anchor: number,
  after: number,
  recurring: { interval: Interval; interval_count: number },
): number {
  for (let k = 1; ; k++) {
    const end = addInterval(
      anchor,
      recurring.interval,
      k * recurring.interval_count,
    );
    if (end > after) return end;
  }
}

interface ListParams {
  limit?: number;
  starting_after?: string;
  ending_before?: string;
}

/** Newest first, with Stripe's cursor parameters. */
export function listOf<T extends { id: string }>(
  items: T[],
  url: string,
  params: ListParams,
): ApiList<T> {
  let newestFirst = [...items].reverse();
  const cursor = params.starting_after ?? params.ending_before;
  if (cursor) {
    const at = newestFirst.findIndex((o) => o.id === cursor);
    const param = params.starting_after ? "starting_after" : "ending_before";
    if (at < 0) throw notFound("object", cursor, param);
    newestFirst = params.starting_after
      ? newestFirst.slice(at + 1)
      : newestFirst.slice(0, at);
  }
  const limit = params.limit ?? 10;
  const data = params.ending_before
    ? newestFirst.slice(-limit)
    : newestFirst.slice(0, limit);
  return { object: "list", data, has_more: newestFirst.length > limit, url };
}

/** Replaces id strings named by `expand` paths with (copies of) the objects. */
export function expandPaths(
  ctx: Ctx,
  body: object,
  paths: string[] | undefined,
): object {
  const copy = structuredClone(body) as Record<string, unknown>;
  for (const path of paths ?? []) expandOne(ctx, copy, path.split("."), path);
  return copy;
}

function expandOne(
  ctx: Ctx,
  target: Record<string, unknown>,
  [head, ...rest]: string[],
  path: string,
): void {
  if (
    head === "data" &&
    Array.isArray(target.data) &&
    target.object === "list"
  ) {
    for (const el of target.data) expandOne(ctx, el, rest, path);
    return;
  }
  let value = target[head];
  if (typeof value === "string") {
    const found = collectionFor(ctx.state, value)?.find((o) => o.id === value);
    if (!found) throw cannotExpand(path);
    value = target[head] = structuredClone(found);
  }
  if (value === null) return;
  if (typeof value !== "object") throw cannotExpand(path);
  if (rest.length) expandOne(ctx, value as Record<string, unknown>, rest, path);
}

function cannotExpand(path: string) {
  return new StripeFakeError(
    400,
    "invalid_request_error",
    `This property cannot be expanded (${path}).`,
    { param: "expand" },
  );
}
