/**
 * The one Stripe client. With STRIPE_API_BASE set (development and tests) it
 * talks to the local fake; with a real key and no base, to Stripe itself.
 */
import Stripe from "stripe";
import { env } from "~/env.server";
import { priceKey, productKey } from "./idempotency";
import { PRICE_CURRENCY, PRODUCT_NAME, UNIT_PRICE_MINOR } from "./plan";

let client: Stripe | undefined;

function localTarget(base: string) {
  const url = new URL(base);
  const protocol = url.protocol === "https:" ? "https" : "http";
  return {
    host: url.hostname,
    port: Number(url.port || (protocol === "https" ? 443 : 80)),
    protocol,
  } as const;
}

export function stripe(): Stripe {
  if (client) return client;
  const { STRIPE_SECRET_KEY, STRIPE_API_BASE } = env();
  client = new Stripe(STRIPE_SECRET_KEY, {
    ...(STRIPE_API_BASE ? localTarget(STRIPE_API_BASE) : {}),
    // The fake answers at once; the real service gets the SDK's retries,
    // which reuse each request's idempotency key.
    maxNetworkRetries: STRIPE_API_BASE ? 0 : 2,
    // Otherwise the SDK writes a telemetry id file under the home folder.
    telemetry: false,
    timeout: 20_000,
  });
  return client;
}

async function findOrCreatePrice(): Promise<string> {
  const lookupKey = env().STRIPE_PRICE_LOOKUP_KEY;
  const api = stripe();
  const found = await api.prices.list({
    lookup_keys: [lookupKey],
    active: true,
    limit: 1,
  });
  if (found.data[0]) return found.data[0].id;
  const product = await api.products.create(
    { name: PRODUCT_NAME, metadata: { lookup_key: lookupKey } },
    { idempotencyKey: productKey(lookupKey) },
  );
  const price = await api.prices.create(
    {
      product: product.id,
      currency: PRICE_CURRENCY,
      unit_amount: UNIT_PRICE_MINOR,
      recurring: { interval: "month" },
      lookup_key: lookupKey,
      nickname: "Per metered site, monthly",
    },
    { idempotencyKey: priceKey(lookupKey, UNIT_PRICE_MINOR) },
  );
  return price.id;
}

let pricePromise: Promise<string> | undefined;

/**
 * The monthly per-site price, found by its lookup key or created once. A
 * failure is not cached, so the next caller tries again.
 */
export function sitePriceId(): Promise<string> {
  pricePromise ??= findOrCreatePrice().catch((error: unknown) => {
    pricePromise = undefined;
    throw error;
  });
  return pricePromise;
}

/** True for errors raised by the SDK (network, API refusal, bad key). */
export function isStripeError(
  error: unknown,
): error is InstanceType<typeof Stripe.errors.StripeError> {
  return error instanceof Stripe.errors.StripeError;
}
