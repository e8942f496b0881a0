import { Form, Link, useNavigation } from "react-router";
import { degreeDayLabel, driverLabels } from "~/baselines/degree-days";
import {
  GUIDELINE_14,
  MODEL_PARAMETERS,
  shortBaselineWarning,
} from "~/baselines/regression";
import type { AnalysisView, SiteView } from "~/baselines/weather-page.server";
import { SectionCard } from "~/components/section-card";
import { Button, Notice } from "~/components/ui";
import { savingsHref } from "~/components/weather/saved-baselines";
import { PassBadge, Stat } from "~/components/weather/stat";
import {
  dayUtc,
  DECIMALS,
  formatNumber,
  formatPercent,
  formatPercentPoints,
  monthShort,
} from "~/lib/format";

/** What the page's save form is answered. */
export interface SaveBaselineResult {
  intent: "save-baseline";
  errors: Record<string, string>;
  message?: string;
}

/**
 * The baseline model, fitted now on the chosen months or saved earlier: its
 * formula, Guideline 14 figures and cautions, and (for a manager, on a model
 * fitted now) the form that saves it.
 */
export function BaselineModelCard({
  view,
  analysis,
  canManage,
  result,
}: {
  view: SiteView;
  analysis: AnalysisView;
  canManage: boolean;
  result: SaveBaselineResult | undefined;
}) {
  const busy = useNavigation().state === "submitting";
  const { model, assessment } = analysis;
  const degreeDays = degreeDayLabel(analysis.driver, analysis.baseC);
  const tooShort = model ? shortBaselineWarning(analysis.basePoints) : null;
  const limits = GUIDELINE_14[view.saved?.granularity ?? "monthly"];
  return (
    <SectionCard
      headingId="model-heading"
      title={view.saved ? "Saved baseline" : "Baseline model"}
    >
      {view.saved ? (
        <p className="mt-1 text-ink-muted">
          Saved {dayUtc(view.saved.createdAt)}
          {view.saved.createdBy ? ` by ${view.saved.createdBy}` : ""}, fitted on{" "}
          {monthShort(view.saved.from)} to {monthShort(view.saved.to)}. Its
          model and months stay as saved.{" "}
          <Link
            className="font-semibold text-spruce-700 underline"
            to={savingsHref(view)}
          >
            Fit on other months instead
          </Link>
        </p>
      ) : (
        <p className="mt-1 text-ink-muted">
          Ordinary least squares of monthly energy on monthly{" "}
          {driverLabels[analysis.driver].toLowerCase()}, over the baseline
          months with complete weather and a ledger entry.
        </p>
      )}
      {model && assessment ? (
        <>
          <p className="mt-4 text-lg">
            <span className="font-semibold">E</span> ={" "}
            <span className="tabular-nums">
              {formatNumber(model.intercept, DECIMALS.kWh)}
            </span>{" "}
            kWh {model.slope < 0 ? "\u2212" : "+"}{" "}
            <span className="tabular-nums">
              {formatNumber(Math.abs(model.slope), 2, { fixed: true })}
            </span>{" "}
            kWh per degree day × {degreeDays}{" "}
            <span className="text-base text-ink-muted">per month</span>
          </p>
          <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-4 xl:grid-cols-2 2xl:grid-cols-4">
            <Stat label="Months (n)">{model.n}</Stat>
            <Stat label="R²">{formatNumber(model.r2, 4, { fixed: true })}</Stat>
            <Stat
              label={`CV(RMSE), limit ${limits.cvrmse} %`}
              badge={<PassBadge pass={assessment.cvrmse.pass} />}
            >
              {formatPercentPoints(model.cvrmse, { decimals: 2 })}
            </Stat>
            <Stat
              label={`NMBE, limit ±${limits.nmbe} %`}
              badge={<PassBadge pass={assessment.nmbe.pass} />}
            >
              {formatPercentPoints(model.nmbe, { decimals: 2, plus: true })}
            </Stat>
          </dl>
          {tooShort ? (
            <div className="mt-3">
              <Notice tone="caution" title="Shorter than a year">
                {tooShort}
              </Notice>
            </div>
          ) : null}
          {model.r2 !== null && model.r2 < 0.5 ? (
            <div className="mt-3">
              <Notice tone="caution">
                R² is {formatNumber(model.r2, 2, { fixed: true })}: the degree
                days explain about {formatPercent(model.r2, { decimals: 0 })} of
                the month-to-month change in this energy, so the model is close
                to a constant. Check the carrier and the kind of degree days.
              </Notice>
            </div>
          ) : null}
          <div className="mt-4 text-sm text-ink-muted">
            <p>
              Criteria of ASHRAE Guideline 14 for{" "}
              {view.saved?.granularity === "daily" ? "daily" : "monthly"} data:
              CV(RMSE) ≤ {limits.cvrmse} % and NMBE within ±{limits.nmbe} %.
            </p>
            <p className="mt-1">
              CV(RMSE) = 100 · √(Σ(actual − model)² ÷ (n − p)) ÷ mean, and NMBE
              = 100 · Σ(actual − model) ÷ ((n − p) · mean), both with the
              divisor n − p = {model.n} − {MODEL_PARAMETERS} ={" "}
              {model.n - MODEL_PARAMETERS} (p = {MODEL_PARAMETERS}: intercept
              and slope). NMBE is positive when the metered energy lies above
              the model. A least-squares fit with an intercept has NMBE 0 on its
              own months by construction.
            </p>
          </div>
        </>
      ) : (
        <div className="mt-3">
          <Notice tone="caution">
            {analysis.modelError ?? "No model for these months."}
          </Notice>
        </div>
      )}
      {canManage && !view.saved && model && view.carrier ? (
        <Form
          method="post"
          className="mt-4 flex flex-wrap items-center gap-3"
          aria-label="Save this baseline"
        >
          <input type="hidden" name="intent" value="save-baseline" />
          <input type="hidden" name="siteId" value={view.site.id} />
          <input type="hidden" name="carrier" value={view.carrier} />
          <input type="hidden" name="driver" value={analysis.driver} />
          <input type="hidden" name="from" value={view.periods.baseFrom} />
          <input type="hidden" name="to" value={view.periods.baseTo} />
          <Button type="submit" disabled={busy}>
            Save baseline
          </Button>
          <span className="text-sm text-ink-muted">
            Keeps this model and its months; the audit log records who saved it.
          </span>
        </Form>
      ) : null}
      {result?.message ? (
        <div className="mt-3">
          <Notice tone="success">{result.message}</Notice>
        </div>
      ) : null}
      {result?.errors.form ? (
        <div className="mt-3">
          <Notice tone="error">{result.errors.form}</Notice>
        </div>
      ) : null}
    </SectionCard>
  );
}
