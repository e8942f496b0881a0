/**
 * What each role may do, as data. The server checks these on every loader and
 * action; the UI reads the same table only to hide what a role cannot use.
 */
export const roles = ["owner", "energy_manager", "finance", "auditor"] as const;
export type Role = (typeof roles)[number];

export const roleLabels: Record<Role, string> = {
  owner: "Owner",
  energy_manager: "Energy manager",
  finance: "Finance",
  auditor: "Auditor",
};

export const roleDescriptions: Record<Role, string> = {
  owner: "Everything, including members and billing.",
  energy_manager:
    "Sites, meters, gateways, readings, estimates and edits, month close.",
  finance: "Billing, and the ledger read-only.",
  auditor:
    "The ledger, readings and audit trail read-only; downloads and verifies reports.",
};

const everyone: readonly Role[] = roles;
/** The roles that run the estate; they also get alerts unless they opt out. */
export const managers: readonly Role[] = ["owner", "energy_manager"];

export const permissions = {
  "organization.view": everyone,
  "members.view": everyone,
  "members.manage": ["owner"],
  "ledger.view": everyone,
  "readings.view": everyone,
  "energy.evaluate": everyone,
  "sites.manage": managers,
  "gateways.manage": managers,
  "readings.edit": managers,
  "months.close": managers,
  "months.reopen": ["owner"],
  "billing.view": ["owner", "finance"],
  "billing.manage": ["owner", "finance"],
  "reports.create": managers,
  "reports.download": everyone,
  "reports.verify": ["owner", "auditor"],
  "audit.view": ["owner", "auditor"],
  /** Tariffs price the ledger: everyone reads them, the estate's managers change them. */
  "tariffs.view": everyone,
  "tariffs.manage": managers,
  /** Organisation API tokens act for the whole organisation: owners only. */
  "tokens.manage": ["owner"],
  /** Emission factors, supply contracts, budgets and the carbon target. */
  "carbon.manage": managers,
  /** Supplier bills: everyone reads them; managers and finance upload, query and resolve them. */
  "bills.view": everyone,
  "bills.manage": ["owner", "energy_manager", "finance"],
  /** The organisation's settings (its financial year). */
  "organization.settings": ["owner"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof permissions;

export function can(role: Role, permission: Permission): boolean {
  return (permissions[permission] as readonly Role[]).includes(role);
}

/**
 * The roles an organisation API token may carry: read-only like an auditor,
 * or running the estate like an energy manager. Owner and finance tokens are
 * not offered: a script has no business managing members or billing.
 */
export const tokenRoles = [
  "auditor",
  "energy_manager",
] as const satisfies readonly Role[];
export type TokenRole = (typeof tokenRoles)[number];

export function isRole(value: unknown): value is Role {
  return (
    typeof value === "string" && (roles as readonly string[]).includes(value)
  );
}

/**
 * The last-owner rule: an organisation always keeps at least one owner, so a
 * change that would leave none is refused.
 */
export function wouldRemoveLastOwner(
  ownerCount: number,
  currentRole: Role,
  nextRole: Role | null,
): boolean {
  return currentRole === "owner" && nextRole !== "owner" && ownerCount <= 1;
}
