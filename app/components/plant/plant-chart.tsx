import {
  CartesianGrid,
  ComposedChart,
  Legend,
  Line,
  ResponsiveContainer,
  Scatter,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { CHART } from "~/components/chart-colours";
import { monthShort } from "~/lib/format";
import type { PlantFigureKey } from "~/plant/plant-performance";
import { formatPlantFigure, plantFigureLabels } from "~/plant/plant-words";

const { ink: INK, grid: GRID, spruce: SPRUCE, danger: DANGER } = CHART;

export interface PlantChartMonth {
  month: string;
  value: number | null;
  limit: number | null;
  fault: boolean;
}

/**
 * The plant's main figure month by month, the limit the laws set as a
 * dashed line, and the months that break it marked in red. Efficiencies
 * are drawn as percentages, COP and EER as ratios.
 */
export function PlantChart({
  figure,
  months,
}: {
  figure: PlantFigureKey;
  months: PlantChartMonth[];
}) {
  const percent = figure !== "cop" && figure !== "eer";
  const scale = (v: number | null) =>
    v === null || !Number.isFinite(v) ? null : percent ? v * 100 : v;
  const data = [...months].reverse().map((m) => ({
    label: monthShort(m.month),
    value: scale(m.value),
    limit: scale(m.limit),
    fault: m.fault ? scale(m.value) : null,
  }));
  const label = plantFigureLabels[figure];
  const show = (v: unknown) =>
    formatPlantFigure(figure, Number(v) / (percent ? 100 : 1));
  return (
    <div
      style={{ width: "100%", height: 240 }}
      role="img"
      aria-label={`${label} by month with the limit the laws set; the table below has the figures`}
    >
      <ResponsiveContainer>
        <ComposedChart
          data={data}
          margin={{ top: 8, right: 8, bottom: 8, left: 8 }}
        >
          <CartesianGrid stroke={GRID} strokeDasharray="3 3" />
          <XAxis dataKey="label" stroke={INK} interval="preserveStartEnd" />
          <YAxis
            stroke={INK}
            width={56}
            domain={[0, "auto"]}
            tickFormatter={(v) => (percent ? `${v} %` : String(v))}
          />
          <Tooltip formatter={(value, name) => [show(value), name]} />
          <Legend />
          <Line
            dataKey="value"
            name={label}
            stroke={SPRUCE}
            strokeWidth={2}
            dot={{ r: 3 }}
            connectNulls={false}
            isAnimationActive={false}
          />
          <Line
            dataKey="limit"
            name="Limit set by the laws"
            stroke={INK}
            strokeDasharray="6 4"
            dot={false}
            isAnimationActive={false}
          />
          <Scatter
            dataKey="fault"
            name="Metering fault"
            fill={DANGER}
            isAnimationActive={false}
          />
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}
