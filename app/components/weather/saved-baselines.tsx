import { Link } from "react-router";
import type { SavedBaseline } from "~/baselines/baselines.server";
import { shortBaselineWarning } from "~/baselines/regression";
import type { SiteView } from "~/baselines/weather-page.server";
import { FigureTable } from "~/components/figure-table";
import { SectionCard } from "~/components/section-card";
import { Badge, cx } from "~/components/ui";
import {
  dayUtc,
  DECIMALS,
  formatNumber,
  formatPercentPoints,
  monthShort,
} from "~/lib/format";

/**
 * This page for the view's site, carrier and reporting months: savings
 * against the saved baseline `baselineId`, or without one a model fitted on
 * the baseline months chosen.
 */
export function savingsHref(view: SiteView, baselineId?: string): string {
  const baseline = baselineId ? `&baseline=${baselineId}` : "";
  return `?site=${view.site.id}&carrier=${view.carrier}${baseline}&reportFrom=${view.periods.reportFrom}&reportTo=${view.periods.reportTo}`;
}

/** The site and carrier's saved baselines, each one click from being used for savings. */
export function SavedBaselines({
  view,
  savedList,
}: {
  view: SiteView;
  savedList: SavedBaseline[];
}) {
  if (savedList.length === 0) return null;
  return (
    <SectionCard headingId="saved-heading" title="Saved baselines">
      <FigureTable
        className="mt-3"
        columns={[
          { label: "Months" },
          { label: "Model" },
          { label: "R²", align: "right" },
          { label: "CV(RMSE)", align: "right" },
          { label: "NMBE", align: "right" },
          { label: "Saved" },
          { label: <span className="sr-only">Use</span> },
        ]}
      >
        {savedList.map((b) => (
          <tr
            key={b.id}
            className={cx(
              "border-t border-line tabular-nums",
              view.saved?.id === b.id && "bg-spruce-50",
            )}
          >
            <td className="px-2 py-1">
              {monthShort(b.from)}–{monthShort(b.to)}
              {shortBaselineWarning(b.model.points) ? (
                <span className="mt-1 block whitespace-nowrap">
                  <Badge tone="copper">Under a year</Badge>
                </span>
              ) : null}
            </td>
            <td className="px-2 py-1">
              {formatNumber(b.model.intercept, DECIMALS.kWh)} +{" "}
              {formatNumber(b.model.slope, 2, { fixed: true })} ×{" "}
              {b.model.driver.toUpperCase()}
            </td>
            <td className="px-2 py-1 text-right">
              {formatNumber(b.model.r2, 4, { fixed: true })}
            </td>
            <td className="px-2 py-1 text-right">
              {formatPercentPoints(b.model.cvrmse, { decimals: 2 })}
            </td>
            <td className="px-2 py-1 text-right">
              {formatPercentPoints(b.model.nmbe, { decimals: 2, plus: true })}
            </td>
            <td className="px-2 py-1">
              {dayUtc(b.createdAt)}
              {b.createdBy ? `, ${b.createdBy}` : ""}
            </td>
            <td className="px-2 py-1">
              {view.saved?.id === b.id ? (
                <Badge tone="spruce">In use</Badge>
              ) : (
                <Link
                  className="font-semibold text-spruce-700 underline"
                  to={savingsHref(view, b.id)}
                >
                  Use for savings
                </Link>
              )}
            </td>
          </tr>
        ))}
      </FigureTable>
    </SectionCard>
  );
}
