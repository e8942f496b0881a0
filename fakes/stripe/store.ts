/**
 * The fake's state: every object in insertion order, plus the clock offset
 * and counters. The whole state is one JSON document so a state file can
 * carry it across restarts.
 */
import { randomBytes } from "node:crypto";
import { existsSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import type {
  CheckoutPlan,
  CheckoutSession,
  Customer,
  DeliveryAttempt,
  Invoice,
  InvoiceItem,
  Metadata,
  PortalSession,
  Price,
  Product,
  StripeEvent,
  Subscription,
} from "./types";

export type * from "./types";

export interface State {
  clockOffset: number;
  invoiceSeq: number;
  customers: Customer[];
  products: Product[];
  prices: Price[];
  subscriptions: Subscription[];
  invoices: Invoice[];
  invoiceItems: InvoiceItem[];
  checkoutSessions: CheckoutSession[];
  checkoutPlans: Record<string, CheckoutPlan>;
  portalSessions: PortalSession[];
  events: StripeEvent[];
  deliveries: Record<string, DeliveryAttempt[]>;
  /** Customers whose next payment attempt is to fail. */
  failNext: string[];
}

export function emptyState(): State {
  return {
    clockOffset: 0,
    invoiceSeq: 0,
    customers: [],
    products: [],
    prices: [],
    subscriptions: [],
    invoices: [],
    invoiceItems: [],
    checkoutSessions: [],
    checkoutPlans: {},
    portalSessions: [],
    events: [],
    deliveries: {},
    failNext: [],
  };
}

export function loadState(file: string | undefined): State {
  if (!file || !existsSync(file)) return emptyState();
  try {
    return { ...emptyState(), ...JSON.parse(readFileSync(file, "utf8")) };
  } catch {
    return emptyState();
  }
}

/** Written through a temporary file so a crash never leaves half a state. */
export function saveState(file: string | undefined, state: State): void {
  if (!file) return;
  writeFileSync(`${file}.tmp`, JSON.stringify(state));
  renameSync(`${file}.tmp`, file);
}

const ALPHABET =
  "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz";

export function newId(prefix: string): string {
  const bytes = randomBytes(16);
  let tail = "";
  for (const b of bytes) tail += ALPHABET[b % ALPHABET.length];
  return `${prefix}_${tail}`;
}

/** Every collection an id can live in, keyed by the id's prefix. */
export function collectionFor(
  state: State,
  id: string,
): Array<{ id: string }> | undefined {
  const prefix = id.slice(0, id.indexOf("_"));
  const map: Record<string, Array<{ id: string }>> = {
    cus: state.customers,
    prod: state.products,
    price: state.prices,
    sub: state.subscriptions,
    in: state.invoices,
    ii: state.invoiceItems,
    cs: state.checkoutSessions,
    bps: state.portalSessions,
    evt: state.events,
  };
  return map[prefix];
}

/** Stripe's metadata update: "" clears all, a key set to "" is removed. */
export function mergeMetadata(
  current: Metadata,
  update: Metadata | "" | undefined,
): Metadata {
  if (update === undefined) return current;
  if (update === "") return {};
  const next = { ...current };
  for (const [key, value] of Object.entries(update)) {
    if (value === "") delete next[key];
    else next[key] = value;
  }
  return next;
}
