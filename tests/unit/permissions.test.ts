import { describe, expect, it } from "vitest";
import {
  can,
  isRole,
  permissions,
  roles,
  tokenRoles,
  wouldRemoveLastOwner,
} from "../../app/auth/permissions";

describe("role rules (design.md, Users and roles)", () => {
  it("owners may do everything", () => {
    for (const permission of Object.keys(
      permissions,
    ) as (keyof typeof permissions)[]) {
      expect(can("owner", permission), permission).toBe(true);
    }
  });

  it("only owners and auditors read the audit trail", () => {
    for (const role of roles) {
      expect(can(role, "audit.view"), role).toBe(
        role === "owner" || role === "auditor",
      );
    }
  });

  it("only owners manage members and reopen months", () => {
    for (const role of roles) {
      expect(can(role, "members.manage")).toBe(role === "owner");
      expect(can(role, "months.reopen")).toBe(role === "owner");
    }
  });

  it("energy managers run sites, gateways, readings and month close, not billing", () => {
    expect(can("energy_manager", "sites.manage")).toBe(true);
    expect(can("energy_manager", "gateways.manage")).toBe(true);
    expect(can("energy_manager", "readings.edit")).toBe(true);
    expect(can("energy_manager", "months.close")).toBe(true);
    expect(can("energy_manager", "billing.manage")).toBe(false);
  });

  it("finance pays and reads; it changes no energy data", () => {
    expect(can("finance", "billing.manage")).toBe(true);
    expect(can("finance", "ledger.view")).toBe(true);
    for (const p of [
      "sites.manage",
      "gateways.manage",
      "readings.edit",
      "months.close",
    ] as const) {
      expect(can("finance", p), p).toBe(false);
    }
  });

  it("auditors read, download and verify, and change nothing", () => {
    expect(can("auditor", "ledger.view")).toBe(true);
    expect(can("auditor", "reports.verify")).toBe(true);
    expect(can("auditor", "reports.download")).toBe(true);
    for (const p of [
      "sites.manage",
      "readings.edit",
      "months.close",
      "billing.view",
      "members.manage",
    ] as const) {
      expect(can("auditor", p), p).toBe(false);
    }
  });

  it("only owners create and revoke organisation API tokens", () => {
    for (const role of roles) {
      expect(can(role, "tokens.manage"), role).toBe(role === "owner");
    }
  });

  it("a token carries a read-only or a managing role, never owner or finance", () => {
    expect([...tokenRoles].sort()).toEqual(["auditor", "energy_manager"]);
    for (const role of tokenRoles) {
      expect(can(role, "tokens.manage"), role).toBe(false);
      expect(can(role, "members.manage"), role).toBe(false);
      expect(can(role, "billing.manage"), role).toBe(false);
    }
  });

  it("recognises exactly the four roles", () => {
    expect(roles.every(isRole)).toBe(true);
    expect(isRole("gateway")).toBe(false);
    expect(isRole("Owner")).toBe(false);
    expect(isRole(undefined)).toBe(false);
  });
});

describe("the last-owner rule", () => {
  it("refuses to demote or remove the only owner", () => {
    expect(wouldRemoveLastOwner(1, "owner", "auditor")).toBe(true);
    expect(wouldRemoveLastOwner(1, "owner", null)).toBe(true);
  });
  it("allows it when another owner remains, and never concerns other roles", () => {
    expect(wouldRemoveLastOwner(2, "owner", "finance")).toBe(false);
    expect(wouldRemoveLastOwner(1, "owner", "owner")).toBe(false);
    expect(wouldRemoveLastOwner(1, "auditor", null)).toBe(false);
  });
});
