import { Scatter, ScatterChart, Tooltip, XAxis, YAxis } from "recharts";
import { useWidth } from "~/lib/use-width";
import { carrierColour } from "~/sites/carrier-colours";
import type { Carrier } from "~/sites/meter-kinds";
import { localParts } from "~/ingest/local-time";
import { dateTimeIn, dayMonthIn, formatHourKwh } from "~/lib/format";
import { qualityLabels, type Interval } from "./use-intervals";

interface Cell {
  hour: number;
  day: number;
  /** "10 Mar 2026, 08:00" in the site's zone. */
  label: string;
  value: number;
  quality: Interval["quality"];
}

/** Local day and hour of each interval, so a carpet shows the site's own day. */
function cellsOf(
  intervals: Interval[],
  timeZone: string,
): { cells: Cell[]; days: string[] } {
  // Local day → its row, and each row's tick ("10 Mar").
  const dayIndex = new Map<string, number>();
  const days: string[] = [];
  const cells: Cell[] = [];
  for (const i of intervals) {
    const at = new Date(i.start);
    const p = localParts(at, timeZone);
    const key = `${p.year}-${p.month}-${p.day}`;
    if (!dayIndex.has(key)) {
      dayIndex.set(key, days.length);
      days.push(dayMonthIn(at, timeZone));
    }
    cells.push({
      hour: p.hour,
      day: dayIndex.get(key)!,
      label: dateTimeIn(at, timeZone),
      value: Number(i.energy_kwh),
      quality: i.quality,
    });
  }
  return { cells, days };
}

const rgbOf = (hex: string) =>
  [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));

/**
 * A sequential scale on |value|, from the paper to the meter's carrier
 * colour (as on every chart), so both signs read the same way.
 */
function colour(value: number, max: number, to: number[]): string {
  const k = max > 0 ? Math.min(1, Math.abs(value) / max) : 0;
  const from = [245, 243, 238];
  const mix = from.map((f, i) => Math.round(f + (to[i] - f) * k));
  return `rgb(${mix.join(",")})`;
}

const MARGIN = { top: 8, right: 16, bottom: 24, left: 8 };
const Y_AXIS_WIDTH = 56;

/** Day × hour heat map: each row a local day, each column an hour. */
export function CarpetPlot({
  intervals,
  timeZone,
  carrier,
}: {
  intervals: Interval[];
  timeZone: string;
  carrier: Carrier;
}) {
  const { ref, width } = useWidth();
  const dark = rgbOf(carrierColour(carrier));
  const { cells, days } = cellsOf(intervals, timeZone);
  const max = Math.max(0, ...cells.map((c) => Math.abs(c.value)));
  const rowHeight = Math.max(6, Math.min(18, 480 / Math.max(1, days.length)));
  const height = days.length * rowHeight + MARGIN.top + MARGIN.bottom + 30;
  const plotWidth = width - MARGIN.left - MARGIN.right - Y_AXIS_WIDTH;
  const shape = (props: { cx?: number; cy?: number; payload?: Cell }) => {
    const { cx = 0, cy = 0, payload } = props;
    const w = Math.max(1, plotWidth / 24);
    return (
      <rect
        x={cx - w / 2}
        y={cy - rowHeight / 2}
        width={w}
        height={rowHeight}
        fill={payload ? colour(payload.value, max, dark) : "none"}
        stroke={payload && payload.quality !== "measured" ? "#7a4b00" : "none"}
        strokeDasharray="2 1"
      />
    );
  };
  return (
    <div
      ref={ref}
      style={{ width: "100%", height }}
      role="img"
      aria-label={`Carpet plot of ${days.length} days by 24 hours`}
    >
      {width > 0 ? (
        <ScatterChart width={width} height={height} margin={MARGIN}>
          <XAxis
            dataKey="hour"
            type="number"
            domain={[-0.5, 23.5]}
            ticks={[0, 3, 6, 9, 12, 15, 18, 21]}
            stroke="#4f5966"
            label={{
              value: "hour of day",
              position: "insideBottom",
              offset: -8,
              fill: "#4f5966",
            }}
          />
          <YAxis
            dataKey="day"
            type="number"
            domain={[-0.5, days.length - 0.5]}
            reversed
            tickFormatter={(d) => days[d] ?? ""}
            interval="preserveStartEnd"
            stroke="#4f5966"
            width={Y_AXIS_WIDTH}
            allowDecimals={false}
          />
          <Tooltip
            cursor={false}
            content={({ payload }) => {
              const c = payload?.[0]?.payload as Cell | undefined;
              return c ? (
                <div className="rounded border border-line bg-surface px-2 py-1 text-sm shadow">
                  {c.label} · {formatHourKwh(c.value)} kWh ·{" "}
                  {qualityLabels[c.quality].toLowerCase()}
                </div>
              ) : null;
            }}
          />
          <Scatter data={cells} shape={shape} isAnimationActive={false} />
        </ScatterChart>
      ) : null}
    </div>
  );
}
