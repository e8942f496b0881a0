import { describe, expect, it } from "vitest";
import {
  billingStanding,
  nextPastDueSince,
  trialEnd,
  type AccountFacts,
} from "./standing";

const now = new Date("2026-06-15T12:00:00Z");
const days = (n: number) => new Date(now.getTime() + n * 86_400_000);

const base: AccountFacts = {
  status: "trialing",
  hasSubscription: false,
  trialEndsAt: days(5),
  pastDueSince: null,
  currentPeriodEnd: null,
  cancelAtPeriodEnd: false,
  updatedAt: days(-20),
};

describe("billing standing", () => {
  it("a running local trial needs nothing and counts its days", () => {
    const s = billingStanding(base, now, 7);
    expect(s.kind).toBe("trial");
    expect(s.trialDaysLeft).toBe(5);
    expect(s.needsAttention).toBe(false);
    expect(s.sitesBlocked).toBe(false);
  });

  it("an ended trial without a subscription is flagged, then blocks after the grace", () => {
    const ended = { ...base, trialEndsAt: days(-2) };
    const s = billingStanding(ended, now, 7);
    expect(s.kind).toBe("trial_ended");
    expect(s.needsAttention).toBe(true);
    expect(s.sitesBlocked).toBe(false);
    expect(s.graceEndsAt).toEqual(days(5));
    const later = billingStanding({ ...base, trialEndsAt: days(-8) }, now, 7);
    expect(later.sitesBlocked).toBe(true);
  });

  it("an active subscription is fine whatever the trial date says", () => {
    const s = billingStanding(
      {
        ...base,
        status: "active",
        hasSubscription: true,
        trialEndsAt: days(-30),
      },
      now,
      7,
    );
    expect(s.kind).toBe("active");
    expect(s.needsAttention).toBe(false);
    expect(s.sitesBlocked).toBe(false);
  });

  it("past due counts its grace from the first missed payment", () => {
    const recent = billingStanding(
      {
        ...base,
        status: "past_due",
        hasSubscription: true,
        pastDueSince: days(-3),
      },
      now,
      7,
    );
    expect(recent.kind).toBe("past_due");
    expect(recent.needsAttention).toBe(true);
    expect(recent.sitesBlocked).toBe(false);
    const old = billingStanding(
      {
        ...base,
        status: "past_due",
        hasSubscription: true,
        pastDueSince: days(-8),
      },
      now,
      7,
    );
    expect(old.sitesBlocked).toBe(true);
  });

  it("unpaid behaves as past due; a missing date starts the grace now", () => {
    const s = billingStanding(
      { ...base, status: "unpaid", hasSubscription: true },
      now,
      0,
    );
    expect(s.kind).toBe("past_due");
    expect(s.troubleSince).toEqual(now);
    expect(s.sitesBlocked).toBe(true);
  });

  it("a cancelled subscription is dated by when it ended, not by later changes to the account", () => {
    const s = billingStanding(
      {
        ...base,
        status: "canceled",
        hasSubscription: true,
        trialEndsAt: days(-60),
        currentPeriodEnd: days(-9),
        updatedAt: days(-1),
      },
      now,
      7,
    );
    expect(s.kind).toBe("canceled");
    expect(s.troubleSince).toEqual(days(-9));
    expect(s.sitesBlocked).toBe(true);
  });

  it("a subscription cancelled inside the trial's dates does not bring the trial back", () => {
    const s = billingStanding(
      {
        ...base,
        status: "canceled",
        hasSubscription: true,
        trialEndsAt: days(5),
        currentPeriodEnd: days(-1),
        updatedAt: now,
      },
      now,
      7,
    );
    expect(s.kind).toBe("canceled");
    expect(s.troubleSince).toEqual(days(-1));
    expect(s.graceEndsAt).toEqual(days(6));
  });

  it("a Checkout that expired unpaid after the trial is an ended trial", () => {
    const s = billingStanding(
      {
        ...base,
        status: "incomplete_expired",
        hasSubscription: true,
        trialEndsAt: days(-2),
      },
      now,
      7,
    );
    expect(s.kind).toBe("trial_ended");
    expect(s.troubleSince).toEqual(days(-2));
  });

  it("an incomplete checkout leaves the trial as it was", () => {
    const s = billingStanding(
      { ...base, status: "incomplete", hasSubscription: true },
      now,
      7,
    );
    expect(s.kind).toBe("trial");
  });
});

describe("trial end and past-due date", () => {
  it("the trial ends a whole number of days after creation", () => {
    expect(trialEnd(new Date("2026-01-01T00:00:00Z"), 14)).toEqual(
      new Date("2026-01-15T00:00:00Z"),
    );
  });

  it("past_due_since is set on entering, kept while staying, cleared on leaving", () => {
    const first = nextPastDueSince("past_due", null, now);
    expect(first).toEqual(now);
    expect(nextPastDueSince("past_due", days(-4), now)).toEqual(days(-4));
    expect(nextPastDueSince("active", days(-4), now)).toBeNull();
    expect(nextPastDueSince("canceled", days(-4), now)).toBeNull();
  });
});
