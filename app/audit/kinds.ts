/**
 * Every kind of change the audit log records, grouped the way the Audit trail
 * page filters them, with the words an energy manager would use. A plain
 * module: the server writes and reads these names, the page shows the labels.
 */

export const auditKinds = [
  "correction",
  "adjustment",
  "month",
  "meter",
  "site",
  "gateway",
  "api_token",
  "member",
  "billing",
  "baseline",
  "report",
  "carbon",
  "tariff",
  "bill",
] as const;
export type AuditKind = (typeof auditKinds)[number];

export const auditKindLabels: Record<AuditKind, string> = {
  correction: "Corrections to hours",
  adjustment: "Adjusting entries",
  month: "Month close and reopen",
  meter: "Meters and swaps",
  site: "Sites",
  gateway: "Gateway keys",
  api_token: "API tokens",
  member: "Members and roles",
  billing: "Billing",
  baseline: "Baselines and weather",
  report: "Signed reports",
  carbon: "Emission factors, budgets and targets",
  tariff: "Tariffs",
  bill: "Supplier bills",
};

/** Each action written to audit_log.action: its kind and its label. */
export const auditActions = {
  "interval.edited": { kind: "correction", label: "Hour corrected" },
  "ledger.adjusted": {
    kind: "adjustment",
    label: "Closed month adjusted",
  },
  "ledger.cost_adjusted": {
    kind: "adjustment",
    label: "Closed month's cost adjusted",
  },
  "tariff.created": { kind: "tariff", label: "Tariff added" },
  "tariff.version_added": { kind: "tariff", label: "Tariff version added" },
  "bills.uploaded": { kind: "bill", label: "Supplier bills uploaded" },
  "bill.state_changed": {
    kind: "bill",
    label: "Supplier bill's state changed",
  },
  "bills.tolerance_set": { kind: "bill", label: "Bill-check tolerance set" },
  "month.closed": { kind: "month", label: "Month closed" },
  "month.reopened": { kind: "month", label: "Month reopened" },
  "meter.created": { kind: "meter", label: "Meter added" },
  "meter.updated": { kind: "meter", label: "Meter settings changed" },
  "meter.retired": { kind: "meter", label: "Meter retired" },
  "meter.replaced": { kind: "meter", label: "Meter swapped" },
  "tank.saved": { kind: "meter", label: "Tank settings saved" },
  "tank.dip_entered": { kind: "meter", label: "Tank dip entered" },
  "tank.delivery_entered": { kind: "meter", label: "Tank delivery entered" },
  "gas.cv_saved": { kind: "meter", label: "Calorific value entered" },
  "gas.cv_deleted": { kind: "meter", label: "Calorific value removed" },
  "gas.settings_saved": {
    kind: "meter",
    label: "Gas register settings changed",
  },
  "site.created": { kind: "site", label: "Site added" },
  "site.updated": { kind: "site", label: "Site details changed" },
  "site.archived": { kind: "site", label: "Site archived" },
  "plant.created": { kind: "site", label: "Plant added" },
  "plant.archived": { kind: "site", label: "Plant archived" },
  "gateway.created": { kind: "gateway", label: "Gateway key issued" },
  "gateway.revoked": { kind: "gateway", label: "Gateway key revoked" },
  "api_token.created": { kind: "api_token", label: "API token issued" },
  "api_token.revoked": { kind: "api_token", label: "API token revoked" },
  "organization.created": { kind: "member", label: "Organisation created" },
  "member.role_changed": { kind: "member", label: "Role changed" },
  "member.removed": { kind: "member", label: "Member removed" },
  "invitation.created": { kind: "member", label: "Invitation sent" },
  "invitation.revoked": { kind: "member", label: "Invitation withdrawn" },
  "invitation.accepted": { kind: "member", label: "Invitation accepted" },
  "billing.opened": { kind: "billing", label: "Billing account opened" },
  "billing.subscription_changed": {
    kind: "billing",
    label: "Subscription changed",
  },
  "billing.sites_changed": { kind: "billing", label: "Billed sites changed" },
  "billing.invoice_changed": {
    kind: "billing",
    label: "Invoice status changed",
  },
  "baseline.saved": { kind: "baseline", label: "Baseline saved" },
  "weather.uploaded": { kind: "baseline", label: "Weather uploaded" },
  "report.requested": { kind: "report", label: "Signed report requested" },
  "emission_factors.saved": {
    kind: "carbon",
    label: "Emission factors saved",
  },
  "emission_contract.created": {
    kind: "carbon",
    label: "Supply contract added",
  },
  "organization.financial_year_changed": {
    kind: "carbon",
    label: "Financial year changed",
  },
  "budget.saved": { kind: "carbon", label: "Budget saved" },
  "carbon_target.saved": { kind: "carbon", label: "Carbon target saved" },
} as const satisfies Record<string, { kind: AuditKind; label: string }>;

export type AuditAction = keyof typeof auditActions;

export function isAuditKind(value: string): value is AuditKind {
  return (auditKinds as readonly string[]).includes(value);
}

/** The actions of one kind, for filtering in SQL. */
export function actionsOfKind(kind: AuditKind): AuditAction[] {
  return (Object.keys(auditActions) as AuditAction[]).filter(
    (action) => auditActions[action].kind === kind,
  );
}

/** The label of an action; one this version does not know shows as written. */
export function actionLabel(action: string): string {
  return (
    (auditActions as Record<string, { label: string }>)[action]?.label ?? action
  );
}

export function kindOf(action: string): AuditKind | null {
  return (
    (auditActions as Record<string, { kind: AuditKind }>)[action]?.kind ?? null
  );
}
