/** What the billing page shows, gathered in one place. */
import { randomUUID } from "node:crypto";
import { desc, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { env } from "~/env.server";
import { billingInvoices } from "~/db/schema";
import {
  ensureBillingAccount,
  hasLiveSubscription,
  standingOf,
  type BillingAccount,
} from "./account.server";
import { SHORT_READ } from "./live-subscription.server";
import { listMeteredSites } from "./metered-sites.server";
import { monthlyEstimateMinor, planQuantity, PRICE_CURRENCY } from "./plan";
import { isStripeError, stripe } from "./stripe.server";

export interface NextInvoiceEstimate {
  amountMinor: number;
  currency: string;
  quantity: number;
  /** stripe: Stripe's preview of the next invoice; count: sites × unit price. */
  basis: "stripe" | "count";
  dueOn: Date | null;
}

async function estimateNextInvoice(
  account: BillingAccount | null,
  meteredSites: number,
): Promise<NextInvoiceEstimate> {
  const byCount: NextInvoiceEstimate = {
    amountMinor: monthlyEstimateMinor(meteredSites),
    currency: PRICE_CURRENCY,
    quantity: planQuantity(meteredSites),
    basis: "count",
    dueOn: null,
  };
  if (!account || !hasLiveSubscription(account)) return byCount;
  try {
    // The page waits for it: a short read, and the count if Stripe is slow.
    const preview = await stripe().invoices.createPreview(
      {
        customer: account.stripeCustomerId,
        subscription: account.stripeSubscriptionId!,
      },
      SHORT_READ,
    );
    return {
      amountMinor: preview.amount_due,
      currency: preview.currency,
      quantity: account.quantity,
      basis: "stripe",
      dueOn: account.currentPeriodEnd,
    };
  } catch (error) {
    console.error(
      "[billing] invoice preview failed:",
      (error as Error).message,
    );
    return { ...byCount, dueOn: account.currentPeriodEnd };
  }
}

function listInvoices(organizationId: string) {
  return db
    .select({
      id: billingInvoices.stripeInvoiceId,
      number: billingInvoices.number,
      status: billingInvoices.status,
      currency: billingInvoices.currency,
      amountDue: billingInvoices.amountDue,
      amountPaid: billingInvoices.amountPaid,
      periodStart: billingInvoices.periodStart,
      periodEnd: billingInvoices.periodEnd,
      hostedInvoiceUrl: billingInvoices.hostedInvoiceUrl,
      createdAt: billingInvoices.createdAt,
    })
    .from(billingInvoices)
    .where(eq(billingInvoices.organizationId, organizationId))
    .orderBy(desc(billingInvoices.createdAt))
    .limit(24);
}

/** Creates the account on first visit; if Stripe is away, shows what is stored. */
async function accountOrProblem(organizationId: string) {
  try {
    return {
      account: await ensureBillingAccount(organizationId),
      problem: null,
    };
  } catch (error) {
    if (!isStripeError(error)) throw error;
    console.error("[billing] could not open the account:", error.message);
    return {
      account: null,
      problem:
        "The payment service did not answer, so subscribing is not possible just now. Your data and sites are not affected.",
    };
  }
}

export async function billingOverview(organizationId: string) {
  const { account, problem } = await accountOrProblem(organizationId);
  const [meteredSites, invoices, standing] = await Promise.all([
    listMeteredSites({ organizationId }),
    listInvoices(organizationId),
    standingOf(organizationId),
  ]);
  return {
    account: account
      ? {
          status: account.status,
          subscribed: hasLiveSubscription(account),
          stripeSubscriptionId: account.stripeSubscriptionId,
          quantity: account.quantity,
          trialEndsAt: account.trialEndsAt,
          currentPeriodEnd: account.currentPeriodEnd,
          cancelAtPeriodEnd: account.cancelAtPeriodEnd,
          pastDueSince: account.pastDueSince,
          lastReconciledAt: account.lastReconciledAt,
        }
      : null,
    standing: standing!,
    meteredSites,
    estimate: await estimateNextInvoice(account, meteredSites.length),
    invoices,
    serviceProblem: problem,
    graceDays: env().BILLING_GRACE_DAYS,
    // Each rendered form is one attempt: resubmitting it reuses its session.
    attempt: randomUUID(),
  };
}

/** What the Billing page shows (its cards take their parts of it). */
export type BillingOverview = Awaited<ReturnType<typeof billingOverview>>;
