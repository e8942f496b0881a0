import { inject } from "vitest";

/**
 * The environment the app's modules validate when a test imports them
 * directly, or spawns a server of its own: the suite's local e-mail and
 * Stripe fakes (global-setup.ts), and no timers of their own.
 */
export function appTestEnv(): Record<string, string> {
  return {
    RESEND_BASE_URL: inject("resendUrl"),
    RESEND_API_KEY: "re_test_key",
    STRIPE_API_BASE: inject("stripeUrl"),
    STRIPE_SECRET_KEY: "sk_test_joulebook",
    STRIPE_WEBHOOK_SECRET: "whsec_test_joulebook_fake",
    BILLING_RECONCILE_MINUTES: "0",
    ALERTS_INTERVAL_MINUTES: "0",
  };
}

/** Sets appTestEnv() on this test process, before any app module loads. */
export function applyAppTestEnv(): void {
  Object.assign(process.env, appTestEnv());
}
