/**
 * Idempotency keys for every Stripe call that changes something. A key names
 * the intended change, so a retry of that change (a network retry, a double
 * click, a replayed job) is answered from Stripe's record instead of being
 * applied twice, while a genuinely new change gets a new key. Stripe keeps
 * keys for at least 24 hours and refuses a reused key with other parameters.
 */
import { createHash } from "node:crypto";

const PREFIX = "joulebook";

function key(...parts: (string | number)[]): string {
  const joined = [PREFIX, ...parts.map(String)].join(":");
  // Stripe allows 255 characters; long causes are hashed to stay well under.
  if (joined.length <= 200) return joined;
  return `${PREFIX}:h:${createHash("sha256").update(joined).digest("hex")}`;
}

/** One customer per organisation, however many requests race to create it. */
export const customerKey = (organizationId: string) =>
  key("customer", organizationId);

export const productKey = (lookupKey: string) => key("product", lookupKey);
export const priceKey = (lookupKey: string, unitAmount: number) =>
  key("price", lookupKey, unitAmount);

/**
 * A Checkout or portal session per submitted form: the page gives each form
 * a fresh attempt id, so resubmitting the same form reuses the session while
 * a later visit starts a new one.
 */
export const checkoutKey = (
  organizationId: string,
  attempt: string,
  quantity: number,
) => key("checkout", organizationId, attempt, quantity);
export const portalKey = (organizationId: string, attempt: string) =>
  key("portal", organizationId, attempt);

/**
 * A quantity change: the subscription item, what caused it (a committed meter
 * or site change, or one reconciliation run) and the quantity it sets.
 */
export const quantityKey = (
  subscriptionItemId: string,
  cause: string,
  quantity: number,
) => key("quantity", subscriptionItemId, cause, quantity);
