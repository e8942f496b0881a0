import {
  Bar,
  CartesianGrid,
  ComposedChart,
  Legend,
  Line,
  ReferenceArea,
  ReferenceLine,
  ResponsiveContainer,
  Scatter,
  ScatterChart,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { CHART } from "~/components/chart-colours";
import { carrierColour } from "~/sites/carrier-colours";
import type { Carrier } from "~/sites/meter-kinds";
import {
  formatDegreeDays,
  formatKwh,
  formatTick,
  monthShort,
} from "~/lib/format";

const { ink: INK, inkStrong: INK_STRONG, grid: GRID, spruce: SPRUCE } = CHART;

/**
 * Energy is drawn in its carrier's colour (app/sites/carrier-colours.ts), as
 * on every chart; degree days, periods and reporting months in ink, so no
 * other carrier's colour appears beside it.
 */
const energyColour = (carrier: Carrier | null) =>
  carrier ? carrierColour(carrier) : SPRUCE;

const kwh = (v: unknown) => formatKwh(Number(v));
const degreeDays = (v: unknown) => formatDegreeDays(Number(v));

/** A round step of about a fifth of `max`: 1, 2, 2.5 or 5 times a power of ten. */
function niceStep(max: number): number {
  const raw = Math.max(max, 1e-9) / 5;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  return (
    ([1, 2, 2.5, 5, 10].find((m) => m * magnitude >= raw) ?? 10) * magnitude
  );
}

/** Ticks from zero to a round end at or above `max`. */
function roundTicks(max: number): number[] {
  const step = niceStep(max);
  const end = Math.max(step, Math.ceil(max / step) * step);
  return Array.from({ length: Math.round(end / step) + 1 }, (_, i) => i * step);
}

export interface ChartMonth {
  month: string;
  dd: number | null;
  kwh: number | null;
}

/** Monthly energy as bars, degree days as a line, the periods shaded. */
export function DegreeDayChart({
  carrier,
  months,
  ddLabel,
  energyLabel,
  baseline,
  reporting,
}: {
  carrier: Carrier | null;
  months: ChartMonth[];
  ddLabel: string;
  energyLabel: string;
  baseline: { from: string; to: string };
  reporting: { from: string; to: string } | null;
}) {
  const data = months.map((m) => ({ ...m, label: monthShort(m.month) }));
  const kwhTicks = roundTicks(Math.max(0, ...months.map((m) => m.kwh ?? 0)));
  const ddTicks = roundTicks(Math.max(0, ...months.map((m) => m.dd ?? 0)));
  const has = (month: string) => months.some((m) => m.month === month);
  return (
    <div
      style={{ width: "100%", height: 320 }}
      role="img"
      aria-label={`${energyLabel} and ${ddLabel.toLowerCase()} for ${months.length} months; the table below has the figures`}
    >
      <ResponsiveContainer>
        <ComposedChart
          data={data}
          margin={{ top: 8, right: 8, bottom: 8, left: 8 }}
        >
          <CartesianGrid stroke={GRID} strokeDasharray="3 3" />
          <XAxis dataKey="label" stroke={INK} interval="preserveStartEnd" />
          <YAxis
            yAxisId="kwh"
            stroke={INK}
            width={84}
            ticks={kwhTicks}
            domain={[0, kwhTicks.at(-1)!]}
            tickFormatter={(v) => formatTick(Number(v))}
            label={{
              value: "kWh",
              angle: -90,
              position: "insideLeft",
              fill: INK,
            }}
          />
          <YAxis
            yAxisId="dd"
            orientation="right"
            stroke={INK_STRONG}
            width={64}
            ticks={ddTicks}
            domain={[0, ddTicks.at(-1)!]}
            label={{
              value: "Degree days",
              angle: 90,
              position: "insideRight",
              fill: INK_STRONG,
            }}
          />
          {has(baseline.from) && has(baseline.to) ? (
            <ReferenceArea
              yAxisId="kwh"
              x1={monthShort(baseline.from)}
              x2={monthShort(baseline.to)}
              fill="#cfe5dc"
              fillOpacity={0.35}
              label={{ value: "Baseline", position: "insideTop", fill: SPRUCE }}
            />
          ) : null}
          {reporting && has(reporting.from) && has(reporting.to) ? (
            <ReferenceArea
              yAxisId="kwh"
              x1={monthShort(reporting.from)}
              x2={monthShort(reporting.to)}
              fill="#ece8df"
              fillOpacity={0.6}
              label={{
                value: "Reporting",
                position: "insideTop",
                fill: INK_STRONG,
              }}
            />
          ) : null}
          <Tooltip
            formatter={(value, name) =>
              name === ddLabel ? [degreeDays(value), name] : [kwh(value), name]
            }
          />
          <Legend />
          <Bar
            yAxisId="kwh"
            dataKey="kwh"
            name={energyLabel}
            fill={energyColour(carrier)}
            isAnimationActive={false}
          />
          <Line
            yAxisId="dd"
            dataKey="dd"
            name={ddLabel}
            stroke={INK_STRONG}
            strokeWidth={2}
            dot={{ r: 3 }}
            connectNulls={false}
            isAnimationActive={false}
          />
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}

export const SCATTER_HEIGHT = 340;

export interface ScatterPoint {
  month: string;
  dd: number;
  kwh: number;
}

/** Energy against degree days: baseline and reporting months, and the model. */
export function BaselineScatter({
  carrier,
  baseline,
  reporting,
  line,
  ddLabel,
}: {
  carrier: Carrier | null;
  baseline: ScatterPoint[];
  reporting: ScatterPoint[];
  line: { intercept: number; slope: number } | null;
  ddLabel: string;
}) {
  const all = [...baseline, ...reporting];
  const xMax = Math.max(1, ...all.map((p) => p.dd));
  const x0 = 0;
  const ticks = roundTicks(xMax * 1.02);
  const x1 = ticks.at(-1)!;
  const yTicks = roundTicks(
    Math.max(
      0,
      ...all.map((p) => p.kwh),
      ...(line ? [line.intercept, line.intercept + line.slope * x1] : []),
    ),
  );
  const tooltip = (p: ScatterPoint) =>
    `${monthShort(p.month)}: ${degreeDays(p.dd)}, ${kwh(p.kwh)}`;
  return (
    <div
      style={{ width: "100%", height: SCATTER_HEIGHT }}
      role="img"
      aria-label={`Monthly energy against ${ddLabel.toLowerCase()}: ${baseline.length} baseline months, ${reporting.length} reporting months${line ? ", with the fitted line" : ""}`}
    >
      <ResponsiveContainer>
        <ScatterChart margin={{ top: 8, right: 16, bottom: 24, left: 8 }}>
          <CartesianGrid stroke={GRID} strokeDasharray="3 3" />
          <XAxis
            type="number"
            dataKey="dd"
            name={ddLabel}
            domain={[x0, x1]}
            ticks={ticks}
            stroke={INK}
            label={{
              value: `${ddLabel} per month`,
              position: "insideBottom",
              offset: -12,
              fill: INK,
            }}
          />
          <YAxis
            type="number"
            dataKey="kwh"
            name="Energy"
            stroke={INK}
            width={84}
            ticks={yTicks}
            domain={[0, yTicks.at(-1)!]}
            tickFormatter={(v) => formatTick(Number(v))}
            label={{
              value: "kWh per month",
              angle: -90,
              position: "insideLeft",
              fill: INK,
            }}
          />
          <Tooltip
            cursor={{ strokeDasharray: "3 3" }}
            content={({ payload }) => {
              const p = payload?.[0]?.payload as ScatterPoint | undefined;
              return p ? (
                <div className="rounded-md border border-line bg-surface px-2 py-1 text-sm shadow">
                  {tooltip(p)}
                </div>
              ) : null;
            }}
          />
          <Legend verticalAlign="top" />
          {line ? (
            <ReferenceLine
              segment={[
                { x: x0, y: line.intercept + line.slope * x0 },
                { x: x1, y: line.intercept + line.slope * x1 },
              ]}
              stroke={INK}
              strokeWidth={2}
              strokeDasharray="6 4"
              ifOverflow="extendDomain"
            />
          ) : null}
          <Scatter
            name="Baseline months"
            data={baseline}
            fill={energyColour(carrier)}
            isAnimationActive={false}
          />
          <Scatter
            name="Reporting months"
            data={reporting}
            fill={INK_STRONG}
            shape="diamond"
            isAnimationActive={false}
          />
        </ScatterChart>
      </ResponsiveContainer>
    </div>
  );
}
