import {
  Bar,
  CartesianGrid,
  ComposedChart,
  Legend,
  Line,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { CHART } from "~/components/chart-colours";
import { formatNumber, formatTick } from "~/lib/format";

export const BUDGET_CHART_HEIGHT = 240;

export interface BudgetChartMonth {
  label: string;
  budget: number;
  actual: number | null;
  forecast: number | null;
}

/**
 * One series' year: the actual to date as columns, the budget (or the
 * carbon target's path) as a line, and the forecast for the months to come
 * dashed, joined to the last month to date.
 */
export function BudgetChart({
  months,
  unit,
  colour,
  budgetName = "Budget",
}: {
  months: BudgetChartMonth[];
  unit: string;
  colour: string;
  budgetName?: string;
}) {
  return (
    <div
      style={{ width: "100%", height: BUDGET_CHART_HEIGHT }}
      role="img"
      aria-label={`Actual against ${budgetName.toLowerCase()} by month, in ${unit}, with the forecast to year end dashed`}
    >
      <ResponsiveContainer>
        <ComposedChart
          data={months}
          margin={{ top: 8, right: 16, bottom: 8, left: 8 }}
        >
          <CartesianGrid stroke={CHART.grid} strokeDasharray="3 3" />
          <XAxis dataKey="label" stroke={CHART.ink} />
          <YAxis stroke={CHART.ink} width={72} tickFormatter={formatTick} />
          <Tooltip formatter={(v) => `${formatNumber(Number(v), 0)} ${unit}`} />
          <Legend />
          <Bar
            dataKey="actual"
            name="Actual"
            fill={colour}
            isAnimationActive={false}
          />
          <Line
            dataKey="budget"
            name={budgetName}
            stroke={CHART.inkStrong}
            strokeWidth={2}
            dot={false}
            isAnimationActive={false}
          />
          <Line
            dataKey="forecast"
            name="Forecast"
            stroke={CHART.danger}
            strokeWidth={2}
            strokeDasharray="6 4"
            dot={false}
            connectNulls={false}
            isAnimationActive={false}
          />
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}
