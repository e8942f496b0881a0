/**
 * Events and their delivery. Every event is logged; when an endpoint is
 * configured it is POSTed there in order, signed the way Stripe signs
 * (`t=<unix>,v1=<HMAC-SHA256 of "<t>.<payload>">`, keyed by the whole
 * `whsec_…` string), and retried a few times when the endpoint fails.
 */
import { createHmac } from "node:crypto";
import { setTimeout as sleep } from "node:timers/promises";
import { newId, type State, type StripeEvent } from "./store";

export const API_VERSION = "2026-10-28.endive";
const MAX_LOGGED_EVENTS = 1000;

export interface WebhookEndpoint {
  url: string;
  secret: string;
}

/** An event decided but not yet published (see Ctx.capture). */
export interface EventDraft {
  type: string;
  created: number;
  object: { id: string };
  previous?: Record<string, unknown>;
}

export function signPayload(payload: string, secret: string): string {
  // The timestamp is wall-clock time, never the fake clock: receivers check
  // it against their own clock (300 s tolerance in the SDK).
  const t = Math.floor(Date.now() / 1000);
  const v1 = createHmac("sha256", secret)
    .update(`${t}.${payload}`)
    .digest("hex");
  return `t=${t},v1=${v1}`;
}

export class WebhookBus {
  endpoint: WebhookEndpoint | null = null;
  private tail: Promise<void> = Promise.resolve();
  /** The last published snapshot of each object, for previous_attributes. */
  private lastSeen = new Map<string, Record<string, unknown>>();

  constructor(
    private readonly state: State,
    private readonly retryDelaysMs: number[],
  ) {}

  draft(type: string, object: { id: string }, created: number): EventDraft {
    const snapshot = structuredClone(object) as { id: string };
    const before = this.lastSeen.get(object.id);
    this.lastSeen.set(object.id, snapshot as Record<string, unknown>);
    const previous =
      before && type.endsWith(".updated")
        ? changedFields(before, snapshot)
        : undefined;
    return { type, created, object: snapshot, previous };
  }

  publish(draft: EventDraft): StripeEvent {
    const event: StripeEvent = {
      id: newId("evt"),
      object: "event",
      api_version: API_VERSION,
      created: draft.created,
      data: {
        object: draft.object,
        ...(draft.previous ? { previous_attributes: draft.previous } : {}),
      },
      livemode: false,
      pending_webhooks: this.endpoint ? 1 : 0,
      request: { id: null, idempotency_key: null },
      type: draft.type,
    };
    this.state.events.push(event);
    this.trimLog();
    this.enqueue(event);
    return event;
  }

  enqueue(event: StripeEvent): void {
    this.tail = this.tail.then(() => this.deliver(event));
  }

  /** Resolves once every queued delivery, retries included, has finished. */
  async flush(): Promise<void> {
    let current: Promise<void>;
    do {
      current = this.tail;
      await current;
    } while (current !== this.tail);
  }

  private async deliver(event: StripeEvent): Promise<void> {
    const endpoint = this.endpoint;
    if (!endpoint) return;
    const payload = JSON.stringify(event, null, 2);
    for (let attempt = 0; ; attempt++) {
      if (await this.attempt(event, endpoint, payload)) {
        event.pending_webhooks = 0;
        return;
      }
      if (attempt >= this.retryDelaysMs.length) return;
      await sleep(this.retryDelaysMs[attempt]);
    }
  }

  private async attempt(
    event: StripeEvent,
    endpoint: WebhookEndpoint,
    payload: string,
  ): Promise<boolean> {
    const log = (this.state.deliveries[event.id] ??= []);
    const at = new Date().toISOString();
    try {
      const response = await fetch(endpoint.url, {
        method: "POST",
        headers: {
          "content-type": "application/json; charset=utf-8",
          "stripe-signature": signPayload(payload, endpoint.secret),
          "user-agent": "Stripe/1.0 (+local Joulebook fake)",
        },
        body: payload,
        signal: AbortSignal.timeout(10_000),
      });
      await response.arrayBuffer();
      log.push({ at, url: endpoint.url, status: response.status });
      return response.ok;
    } catch (error) {
      log.push({ at, url: endpoint.url, status: null, error: String(error) });
      return false;
    }
  }

  private trimLog(): void {
    const excess = this.state.events.length - MAX_LOGGED_EVENTS;
    if (excess <= 0) return;
    for (const old of this.state.events.splice(0, excess))
      delete this.state.deliveries[old.id];
  }
}

function changedFields(
  before: Record<string, unknown>,
  after: Record<string, unknown>,
): Record<string, unknown> | undefined {
  const changed: Record<string, unknown> = {};
  for (const key of Object.keys(before)) {
    if (JSON.stringify(before[key]) !== JSON.stringify(after[key]))
      changed[key] = before[key];
  }
  return Object.keys(changed).length ? changed : undefined;
}
