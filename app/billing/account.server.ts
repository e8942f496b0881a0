/**
 * The organisation's billing account: its Stripe customer, the local trial
 * and the subscription state Stripe's events keep up to date.
 */
import { eq } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db, type Executor } from "~/db/client.server";
import { billingAccounts, organizations } from "~/db/schema";
import { env } from "~/env.server";
import { customerKey } from "./idempotency";
import { billingStanding, trialEnd, type AccountFacts } from "./standing";
import { stripe } from "./stripe.server";

export type BillingAccount = typeof billingAccounts.$inferSelect;

export async function findBillingAccount(
  organizationId: string,
  executor: Executor = db,
): Promise<BillingAccount | null> {
  const [row] = await executor
    .select()
    .from(billingAccounts)
    .where(eq(billingAccounts.organizationId, organizationId));
  return row ?? null;
}

/**
 * A Stripe customer for the organisation. The key is the organisation's id
 * and the parameters never vary, so concurrent first uses get one customer.
 */
export async function createStripeCustomer(org: {
  id: string;
  name: string;
}): Promise<string> {
  // A person waits for it (sign-up, the first Billing page): a short
  // timeout per try; the client's retries are safe under the key.
  const customer = await stripe().customers.create(
    { name: org.name, metadata: { organization_id: org.id } },
    { idempotencyKey: customerKey(org.id), timeout: 10_000 },
  );
  return customer.id;
}

/** The row a new account starts with: a local trial, no subscription. */
export function newAccountValues(args: {
  organizationId: string;
  stripeCustomerId: string;
  trialStart: Date;
}) {
  return {
    organizationId: args.organizationId,
    stripeCustomerId: args.stripeCustomerId,
    status: "trialing",
    trialEndsAt: trialEnd(args.trialStart, env().BILLING_TRIAL_DAYS),
  };
}

/**
 * The account, created the first time billing is needed. Organisations made
 * before billing existed get a trial counted from their creation.
 */
export async function ensureBillingAccount(
  organizationId: string,
): Promise<BillingAccount> {
  const existing = await findBillingAccount(organizationId);
  if (existing) return existing;
  const [org] = await db
    .select({ name: organizations.name, createdAt: organizations.createdAt })
    .from(organizations)
    .where(eq(organizations.id, organizationId));
  if (!org) throw new Error(`no organisation ${organizationId}`);
  const customerId = await createStripeCustomer({
    id: organizationId,
    name: org.name,
  });
  await db.transaction(async (tx) => {
    const [opened] = await tx
      .insert(billingAccounts)
      .values(
        newAccountValues({
          organizationId,
          stripeCustomerId: customerId,
          trialStart: org.createdAt,
        }),
      )
      .onConflictDoNothing()
      .returning();
    // A concurrent first use opened it already, and recorded that.
    if (!opened) return;
    await recordAudit(tx, {
      organizationId,
      actorUserId: null,
      action: "billing.opened",
      subject: customerId,
      reason: "Free trial started",
      after: { status: opened.status, trialEndsAt: opened.trialEndsAt },
    });
  });
  return (await findBillingAccount(organizationId))!;
}

export function factsOf(account: BillingAccount): AccountFacts {
  return {
    status: account.status,
    hasSubscription: account.stripeSubscriptionId !== null,
    trialEndsAt: account.trialEndsAt,
    pastDueSince: account.pastDueSince,
    currentPeriodEnd: account.currentPeriodEnd,
    cancelAtPeriodEnd: account.cancelAtPeriodEnd,
    updatedAt: account.updatedAt,
  };
}

/**
 * The standing from the database alone, for every page: an organisation
 * without an account yet is in the trial its creation date gives it.
 */
export async function standingOf(organizationId: string, now = new Date()) {
  const [row] = await db
    .select({ createdAt: organizations.createdAt, account: billingAccounts })
    .from(organizations)
    .leftJoin(
      billingAccounts,
      eq(billingAccounts.organizationId, organizations.id),
    )
    .where(eq(organizations.id, organizationId));
  if (!row) return null;
  const { BILLING_TRIAL_DAYS, BILLING_GRACE_DAYS } = env();
  const facts: AccountFacts = row.account
    ? factsOf(row.account)
    : {
        status: "trialing",
        hasSubscription: false,
        trialEndsAt: trialEnd(row.createdAt, BILLING_TRIAL_DAYS),
        pastDueSince: null,
        currentPeriodEnd: null,
        cancelAtPeriodEnd: false,
        updatedAt: row.createdAt,
      };
  return billingStanding(facts, now, BILLING_GRACE_DAYS);
}

/** Subscription statuses that still bill, so the quantity must follow the estate. */
export const BILLING_STATUSES = new Set([
  "active",
  "trialing",
  "past_due",
  "unpaid",
  "incomplete",
  "paused",
]);

export function hasLiveSubscription(account: BillingAccount | null): boolean {
  return Boolean(
    account?.stripeSubscriptionId && BILLING_STATUSES.has(account.status),
  );
}
