/**
 * Billing state in the audit trail. Stripe and Joulebook's own jobs change it
 * (no person does), so entries have no actor; the reason says what caused
 * the change: a Stripe event, a reconciliation, a change to the estate.
 */
import { changedFields, recordAudit } from "~/audit/record-audit.server";
import type { Executor } from "~/db/client.server";
import type { BillingAccount } from "./account.server";

type AccountState = Pick<
  BillingAccount,
  | "status"
  | "stripeSubscriptionId"
  | "quantity"
  | "currentPeriodEnd"
  | "cancelAtPeriodEnd"
>;

/** The account's state under the names app/audit/describe.ts shows. */
function facts(state: AccountState): Record<string, unknown> {
  return {
    status: state.status,
    subscription: state.stripeSubscriptionId,
    billedSites: state.quantity,
    currentPeriodEnd: state.currentPeriodEnd,
    cancelAtPeriodEnd: state.cancelAtPeriodEnd,
  };
}

/** Records what changed between two states of the account, if anything did. */
export async function recordBillingChange(
  tx: Executor,
  args: {
    organizationId: string;
    before: AccountState;
    after: AccountState;
    reason: string;
  },
): Promise<void> {
  const changed = changedFields(facts(args.before), facts(args.after));
  if (!changed) return;
  const onlySites = Object.keys(changed.after).every(
    (k) => k === "billedSites",
  );
  await recordAudit(tx, {
    organizationId: args.organizationId,
    actorUserId: null,
    action: onlySites
      ? "billing.sites_changed"
      : "billing.subscription_changed",
    subject: args.after.stripeSubscriptionId ?? args.organizationId,
    reason: args.reason,
    ...changed,
  });
}
