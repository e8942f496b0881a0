import { useState, type ComponentProps, type ReactNode } from "react";
import { SectionCard } from "~/components/section-card";
import { LedgerGrid } from "./ledger-grid";
import type { LedgerRow } from "./use-ledger";

/**
 * The audit trail filtered to one row's adjusting entries: its site, month
 * and carrier, made since the month was closed (as the ledger counts them).
 */
export function adjustmentsHref(orgId: string, row: LedgerRow): string {
  const query = new URLSearchParams({
    kind: "adjustment",
    site: row.site_id,
    month: row.month,
    carrier: row.carrier,
  });
  if (row.closed_at) query.set("since", row.closed_at);
  return `/o/${orgId}/audit?${query}`;
}

function Legend({ children }: { children: ReactNode }) {
  return <p className="mt-3 text-sm text-ink-muted">{children}</p>;
}

/** The monthly entries' grid, with what its columns mean. */
export function LedgerEntries(
  grid: Omit<ComponentProps<typeof LedgerGrid>, "showExergy">,
) {
  // Exergy is a second view of the heat rows: a switch, so the energy
  // columns keep their room until it is asked for.
  const [showExergy, setShowExergy] = useState(false);
  const hasHeat = grid.ledger.rows.some(
    (r) => r.carrier === "heat" || r.carrier === "cooling",
  );
  return (
    <SectionCard headingId="ledger-heading" title="Monthly entries">
      {hasHeat ? (
        <label className="mt-3 flex min-h-10 items-center gap-2 font-semibold">
          <input
            type="checkbox"
            checked={showExergy}
            onChange={(e) => setShowExergy(e.target.checked)}
            className="h-5 w-5 accent-spruce-700"
          />
          Exergy beside heat and cooling
        </label>
      ) : null}
      <div className="mt-3">
        <LedgerGrid {...grid} showExergy={hasHeat && showExergy} />
      </div>
      <Legend>
        Estimated share: the part of the net figure that comes from estimated
        intervals. Exergy (heat and cooling): the work-equivalent of the heat at
        each day&apos;s outdoor temperature; &ldquo;no data&rdquo; where part of
        the month has no flow and return temperatures, no weather, or estimated
        or corrected intervals. ± uncertainty: the heat meters' maximum
        permissible error (EN 1434), where it applies. Adjustments: corrections
        entered after the month was closed, with their count
        {grid.adjustmentsLink
          ? "; select one to see its entries in the audit trail"
          : ""}
        .
        {grid.perM2
          ? " Per m²: each site's figures divided by its floor area; a carrier's total by the floor area of the sites listed with it."
          : ""}{" "}
        One total row per carrier (carriers are never added together); each adds
        its uncertainty bands, a bound that holds even when meter errors are
        correlated.
      </Legend>
    </SectionCard>
  );
}
