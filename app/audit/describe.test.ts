import { describe, expect, it } from "vitest";
import { describeChanges, sideText } from "./describe";
import { actionLabel, actionsOfKind, auditActions, kindOf } from "./kinds";
import { changedFields } from "./record-audit.server";

const names = { meterCodes: new Map([["m-2", "E-NEW"]]) };

describe("before and after in words", () => {
  it("names fields and formats values as people read them", () => {
    expect(
      describeChanges(
        { role: "finance", energyKwh: "-1234.500000", quality: "estimated" },
        { role: "auditor", energyKwh: "12.000000", quality: "edited" },
        names,
      ),
    ).toEqual([
      { field: "Energy", before: "\u22121,234.5 kWh", after: "12 kWh" },
      { field: "Quality", before: "Estimated", after: "Corrected by hand" },
      { field: "Role", before: "Finance", after: "Auditor" },
    ]);
  });

  it("shows chosen dates without a time, other instants in UTC, meters by code", () => {
    expect(
      describeChanges(
        { removedAt: null, trialEndsAt: "2026-03-01T09:30:00.000Z" },
        {
          removedAt: "2026-04-01T00:00:00.000Z",
          trialEndsAt: "2026-03-15T09:30:00.000Z",
          replacementMeterId: "m-2",
        },
        names,
      ),
    ).toEqual([
      { field: "Removed on", before: "—", after: "1 Apr 2026" },
      { field: "Replaced by", before: "—", after: "E-NEW" },
      {
        field: "Trial ends",
        before: "1 Mar 2026, 09:30 UTC",
        after: "15 Mar 2026, 09:30 UTC",
      },
    ]);
  });

  it("leaves out what did not change and the empty settings of something new", () => {
    const lines = describeChanges(
      null,
      { name: "Roof solar", serial: "", multiplier: "1.0000", custom: true },
      names,
    );
    expect(lines).toEqual([
      { field: "Name", before: "—", after: "Roof solar" },
      { field: "Multiplier", before: "—", after: "1" },
      { field: "Custom", before: "—", after: "Yes" },
    ]);
    expect(
      describeChanges({ state: "open" }, { state: "open" }, names),
    ).toEqual([]);
  });

  it("rounds a baseline's fitted coefficients", () => {
    expect(
      describeChanges(
        null,
        { slope: 30.000000412, intercept: -1.23456 },
        names,
      ),
    ).toEqual([
      { field: "Slope (kWh per degree day)", before: "—", after: "30" },
      { field: "Base load (kWh per month)", before: "—", after: "\u22121.235" },
    ]);
  });

  it("writes one side on one line for the CSV", () => {
    const lines = describeChanges(
      { role: "owner" },
      { role: "auditor", email: "a@example.org" },
      names,
    );
    expect(sideText(lines, "before")).toBe("Role: Owner");
    expect(sideText(lines, "after")).toBe(
      "Role: Auditor; E-mail: a@example.org",
    );
  });
});

describe("changed fields", () => {
  it("keeps only fields whose stored values differ, and null when none do", () => {
    const when = new Date("2026-01-01T00:00:00Z");
    expect(
      changedFields(
        { name: "A", multiplier: "1.0000", installedAt: when },
        {
          name: "B",
          multiplier: "1.0000",
          installedAt: new Date(when.getTime()),
        },
      ),
    ).toEqual({ before: { name: "A" }, after: { name: "B" } });
    expect(changedFields({ name: "A" }, { name: "A" })).toBeNull();
  });
});

describe("kinds of change", () => {
  it("every action belongs to a kind with a label; unknown actions show as written", () => {
    for (const action of Object.keys(auditActions)) {
      expect(kindOf(action), action).not.toBeNull();
      expect(actionsOfKind(kindOf(action)!)).toContain(action);
    }
    expect(actionsOfKind("adjustment")).toEqual([
      "ledger.adjusted",
      "ledger.cost_adjusted",
    ]);
    expect(actionLabel("something.new")).toBe("something.new");
    expect(kindOf("something.new")).toBeNull();
  });
});
