import type { ReactNode } from "react";
import { Link } from "react-router";
import { FULL_YEAR_MONTHS } from "~/baselines/regression";
import type { BaselineComparison } from "~/overview/estate-overview.server";
import { SectionCard } from "~/components/section-card";
import {
  SiteChangeRow,
  SiteChangeTable,
  type MonthOfSitesProps,
} from "~/components/overview/site-change-table";
import { EmptyState } from "~/components/ui";

/** Beyond this share either side of the baseline, a month is marked. */
const BASELINE_TOLERANCE = 0.1;

/**
 * Why a row's figures need care: a missing figure, degree days outside the
 * fitted range, or a baseline fitted on under a year (the same rule as the
 * Weather & baselines page and the signed reports).
 */
function baselineNote(r: BaselineComparison): ReactNode {
  const notes = [
    r.note ??
      (r.extrapolated ? "degree days outside the baseline's range" : null),
  ].filter(Boolean);
  const short = r.months_fitted < FULL_YEAR_MONTHS;
  if (!notes.length && !short) return null;
  return (
    <>
      {notes.join("; ")}
      {short ? (
        <span className="block font-semibold text-caution-700" data-short-fit>
          Fitted on {r.months_fitted} month{r.months_fitted === 1 ? "" : "s"}{" "}
          only: treat with caution
        </span>
      ) : null}
    </>
  );
}

/** Each site's `month` against what its newest saved baseline predicts. */
export function AgainstBaseline({
  rows,
  month,
  base,
}: MonthOfSitesProps<BaselineComparison>) {
  return (
    <SectionCard headingId="baseline-heading" title="Against baseline">
      <p className="text-sm text-ink-muted">
        {month} against what each site's newest saved baseline predicts for that
        month's degree days: ▲ more energy than expected, ▼ less; solid beyond ±
        {BASELINE_TOLERANCE * 100} %.
      </p>
      {rows.length === 0 ? (
        <div className="mt-3">
          <EmptyState title="No baseline saved yet">
            Fit and save one for a site on{" "}
            <Link
              className="font-semibold text-spruce-700 underline"
              to={`${base}/weather`}
            >
              Weather &amp; baselines
            </Link>
            ; each month is then set against it here.
          </EmptyState>
        </div>
      ) : (
        <SiteChangeTable
          figureHeadings={["Actual", "Expected"]}
          changeHeading="Difference"
        >
          {rows.map((r) => (
            <SiteChangeRow
              key={`${r.site_id}|${r.carrier}`}
              siteId={r.site_id}
              siteName={r.site_name}
              siteLink={`${base}/weather?site=${r.site_id}&carrier=${r.carrier}&baseline=${r.baseline_id}&reportFrom=${r.month}&reportTo=${r.month}`}
              note={baselineNote(r)}
              carrier={r.carrier}
              figures={[r.actual_kwh, r.expected_kwh]}
              change={r.difference}
              tolerance={BASELINE_TOLERANCE}
              data={{
                "data-actual-kwh": r.actual_kwh?.toFixed(3),
                "data-expected-kwh": r.expected_kwh?.toFixed(3),
              }}
            />
          ))}
        </SiteChangeTable>
      )}
    </SectionCard>
  );
}
