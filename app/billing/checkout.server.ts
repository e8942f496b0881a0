/**
 * Sending finance staff to Stripe: Checkout to subscribe, the billing portal
 * to change the payment method, see invoices or cancel.
 */
import { appUrl } from "~/env.server";
import { ensureBillingAccount, hasLiveSubscription } from "./account.server";
import { checkoutKey, portalKey } from "./idempotency";
import { countMeteredSites } from "./metered-sites.server";
import { planQuantity } from "./plan";
import { sitePriceId, stripe } from "./stripe.server";

export class BillingRuleError extends Error {}

const billingPage = (organizationId: string) =>
  `${appUrl()}/o/${organizationId}/billing`;

/**
 * A Checkout session for the monthly per-site plan. No trial is passed on:
 * subscribing starts the paid plan at once, ending the local trial.
 */
export async function startCheckout(args: {
  organizationId: string;
  attempt: string;
}): Promise<string> {
  const account = await ensureBillingAccount(args.organizationId);
  if (hasLiveSubscription(account)) {
    throw new BillingRuleError(
      "This organisation is subscribed already. Use “Manage payment and invoices” to change it.",
    );
  }
  const quantity = planQuantity(
    await countMeteredSites({ organizationId: args.organizationId }),
  );
  const price = await sitePriceId();
  const session = await stripe().checkout.sessions.create(
    {
      mode: "subscription",
      customer: account.stripeCustomerId,
      client_reference_id: args.organizationId,
      metadata: { organization_id: args.organizationId },
      subscription_data: {
        metadata: { organization_id: args.organizationId },
      },
      line_items: [{ price, quantity }],
      success_url: `${billingPage(args.organizationId)}?checkout=done`,
      cancel_url: `${billingPage(args.organizationId)}?checkout=cancelled`,
    },
    {
      idempotencyKey: checkoutKey(args.organizationId, args.attempt, quantity),
    },
  );
  if (!session.url)
    throw new Error(`checkout session ${session.id} has no URL`);
  return session.url;
}

export async function openBillingPortal(args: {
  organizationId: string;
  attempt: string;
}): Promise<string> {
  const account = await ensureBillingAccount(args.organizationId);
  const session = await stripe().billingPortal.sessions.create(
    {
      customer: account.stripeCustomerId,
      return_url: billingPage(args.organizationId),
    },
    { idempotencyKey: portalKey(args.organizationId, args.attempt) },
  );
  return session.url;
}
