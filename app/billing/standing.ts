/**
 * Where an organisation stands with its bill, worked out from the stored
 * billing account alone (no call to Stripe), so every page can afford it.
 */

export interface AccountFacts {
  /** Stripe's subscription status, or none / trialing for the local trial. */
  status: string;
  hasSubscription: boolean;
  trialEndsAt: Date | null;
  pastDueSince: Date | null;
  currentPeriodEnd: Date | null;
  cancelAtPeriodEnd: boolean;
  /** Last change of the account; dates a cancellation stored without its end. */
  updatedAt: Date;
}

export type StandingKind =
  "trial" | "trial_ended" | "active" | "past_due" | "canceled";

export interface Standing {
  kind: StandingKind;
  trialEndsAt: Date | null;
  /** Whole days of trial left, rounded up; null outside the trial. */
  trialDaysLeft: number | null;
  /** When the trouble began: trial end, first missed payment, cancellation. */
  troubleSince: Date | null;
  /** Until then everything works; after it new sites are refused. */
  graceEndsAt: Date | null;
  needsAttention: boolean;
  sitesBlocked: boolean;
}

const DAY_MS = 86_400_000;

/** Statuses of a subscription that no longer bills. */
const ENDED = new Set(["canceled", "incomplete_expired"]);
/** Statuses of a subscription that bills and is paid up. */
const PAID_UP = new Set(["active", "trialing"]);

function classify(
  facts: AccountFacts,
  now: Date,
): { kind: StandingKind; since: Date | null } {
  const live =
    facts.hasSubscription &&
    !ENDED.has(facts.status) &&
    facts.status !== "incomplete";
  if (live) {
    if (PAID_UP.has(facts.status)) return { kind: "active", since: null };
    // past_due, unpaid, paused: the subscription exists but is not being paid.
    return { kind: "past_due", since: facts.pastDueSince ?? now };
  }
  // A paid plan that ended: subscribing ended the trial, so it does not
  // come back, even inside its original dates.
  // Its end is stored as the period end (Stripe's ended_at), so later
  // writes to the account (a reconciliation) do not move the grace period.
  if (facts.hasSubscription && facts.status === "canceled")
    return {
      kind: "canceled",
      since: facts.currentPeriodEnd ?? facts.updatedAt,
    };
  // No subscription, or a Checkout that never got paid (incomplete, expired).
  if (facts.trialEndsAt && now < facts.trialEndsAt)
    return { kind: "trial", since: null };
  return { kind: "trial_ended", since: facts.trialEndsAt ?? now };
}

export function billingStanding(
  facts: AccountFacts,
  now: Date,
  graceDays: number,
): Standing {
  const { kind, since } = classify(facts, now);
  const graceEndsAt = since
    ? new Date(since.getTime() + graceDays * DAY_MS)
    : null;
  const needsAttention = since !== null;
  return {
    kind,
    trialEndsAt: facts.trialEndsAt,
    trialDaysLeft:
      kind === "trial" && facts.trialEndsAt
        ? Math.ceil((facts.trialEndsAt.getTime() - now.getTime()) / DAY_MS)
        : null,
    troubleSince: since,
    graceEndsAt,
    needsAttention,
    sitesBlocked: needsAttention && graceEndsAt !== null && now >= graceEndsAt,
  };
}

/** A billing account's trial end for an organisation created at `createdAt`. */
export function trialEnd(createdAt: Date, trialDays: number): Date {
  return new Date(createdAt.getTime() + trialDays * DAY_MS);
}

/**
 * past_due_since follows the status: set on entering past due to the time
 * Stripe says the trouble began (kept while it stays there), cleared on
 * leaving it.
 */
export function nextPastDueSince(
  nextStatus: string,
  previousSince: Date | null,
  troubleBegan: Date,
): Date | null {
  const behind = nextStatus === "past_due" || nextStatus === "unpaid";
  if (!behind) return null;
  return previousSince ?? troubleBegan;
}
