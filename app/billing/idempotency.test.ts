import { describe, expect, it } from "vitest";
import { checkoutKey, customerKey, priceKey, quantityKey } from "./idempotency";

describe("idempotency keys", () => {
  it("are stable for the same intended change", () => {
    expect(customerKey("org-1")).toBe(customerKey("org-1"));
    expect(quantityKey("si_1", "meter.created:m1", 2)).toBe(
      quantityKey("si_1", "meter.created:m1", 2),
    );
    expect(checkoutKey("org-1", "a1", 3)).toBe(checkoutKey("org-1", "a1", 3));
  });

  it("differ for a different change", () => {
    expect(quantityKey("si_1", "meter.created:m1", 2)).not.toBe(
      quantityKey("si_1", "meter.created:m2", 2),
    );
    expect(quantityKey("si_1", "meter.created:m1", 2)).not.toBe(
      quantityKey("si_1", "meter.created:m1", 3),
    );
    expect(checkoutKey("org-1", "a1", 3)).not.toBe(
      checkoutKey("org-1", "a2", 3),
    );
    expect(priceKey("plan", 2900)).not.toBe(priceKey("plan", 3100));
  });

  it("stay within Stripe's length limit", () => {
    const long = quantityKey("si_1", "x".repeat(500), 1);
    expect(long.length).toBeLessThanOrEqual(255);
    expect(long).toBe(quantityKey("si_1", "x".repeat(500), 1));
  });
});
