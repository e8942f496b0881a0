import {
  BUDGET_CHART_HEIGHT,
  BudgetChart,
} from "~/components/budgets/budget-chart";
import { WhenInView } from "~/components/when-in-view";
import { CHART } from "~/components/chart-colours";
import { SectionCard } from "~/components/section-card";
import { decimalAsTyped, formatCost, formatNumber } from "~/lib/format";
import { carrierColour } from "~/sites/carrier-colours";
import { carrierLabels, type Carrier } from "~/sites/meter-kinds";
import type { OverviewBudgets } from "~/budgets/overview-budgets.server";

function amount(value: string, unit: string): string {
  if (/^[A-Z]{3}$/.test(unit)) return formatCost(value, unit);
  return `${formatNumber(Number(value), 0)} ${unit}`;
}

function titleOf(key: string, title: string): string {
  if (!key.startsWith("kwh-")) return title;
  return `${carrierLabels[title as Carrier] ?? title}, kWh`;
}

function colourOf(key: string, title: string): string {
  if (key.startsWith("kwh-")) return carrierColour(title as Carrier);
  return key === "carbon" ? CHART.ink : CHART.spruce;
}

/**
 * The current financial year against its budgets and the carbon target:
 * one chart per series, since kWh of unlike carriers are never added.
 */
export function BudgetOverview({ budgets }: { budgets: OverviewBudgets }) {
  const { carbonTarget } = budgets;
  return (
    <SectionCard
      headingId="budget-heading"
      title={`${budgets.label}: against budget and target`}
    >
      <p className="text-sm text-ink-muted">
        Columns are the actual to date, the line the budget; the dashed line is
        the forecast to year end: each month to come is its budget scaled by the
        year to date’s actual ÷ budget.
        {carbonTarget
          ? ` Carbon target: ${decimalAsTyped(carbonTarget.reductionPercent)} % below ${carbonTarget.baseYearLabel} (${carbonTarget.basis}-based), ${amount(carbonTarget.allowedKg, "kg CO₂e")} for the year.`
          : null}
      </p>
      <div className="mt-4 grid gap-6 lg:grid-cols-2">
        {budgets.series.map((s) => (
          <figure key={s.key} data-testid={`budget-${s.key}`}>
            <figcaption className="text-sm font-semibold text-ink">
              {titleOf(s.key, s.title)}
            </figcaption>
            <dl className="mt-1 grid grid-cols-3 gap-2 text-xs text-ink-muted">
              <div>
                <dt>Actual to date</dt>
                <dd className="text-sm text-ink">
                  {amount(s.actualToDate, s.unit)}
                </dd>
              </div>
              <div>
                <dt>
                  {s.key === "carbon" ? "Target to date" : "Budget to date"}
                </dt>
                <dd className="text-sm text-ink">
                  {amount(s.budgetToDate, s.unit)}
                </dd>
              </div>
              <div>
                <dt>
                  Forecast / {s.key === "carbon" ? "target" : "budget"} for the
                  year
                </dt>
                <dd className="text-sm text-ink">
                  {amount(s.forecast, s.unit)} / {amount(s.budget, s.unit)}
                </dd>
              </div>
            </dl>
            {/* Most of these charts are below the fold: each is drawn as it
                comes into view, not all at once when the page loads. */}
            <WhenInView height={BUDGET_CHART_HEIGHT}>
              <BudgetChart
                months={s.months}
                unit={s.unit}
                colour={colourOf(s.key, s.title)}
                budgetName={s.key === "carbon" ? "Target" : "Budget"}
              />
            </WhenInView>
          </figure>
        ))}
      </div>
    </SectionCard>
  );
}
