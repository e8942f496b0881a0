import {
  Area,
  AreaChart,
  CartesianGrid,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { carrierColours } from "~/sites/carrier-colours";
import type { Carrier } from "~/sites/meter-kinds";
import {
  dateTimeIn,
  dayMonthIn,
  formatHourKwh,
  formatTick,
} from "~/lib/format";
import { localParts } from "~/ingest/local-time";
import type { Interval } from "./use-intervals";

/**
 * Hourly energy over the range (a finer meter's intervals summed per hour by
 * hourlyTotals): actual hours in the carrier's colours (as on
 * every chart), estimated and corrected hours in the caution colour the interval
 * grid gives them.
 */
export function LoadProfile({
  intervals,
  timeZone,
  carrier,
}: {
  intervals: Interval[];
  timeZone: string;
  carrier: Carrier;
}) {
  const colour = carrierColours[carrier];
  const ticks = midnightTicks(intervals, timeZone);
  const data = intervals.map((i) => {
    const v = Number(i.energy_kwh);
    return {
      t: new Date(i.start).getTime(),
      measured: i.quality === "measured" ? v : null,
      other: i.quality !== "measured" ? v : null,
    };
  });
  return (
    <div
      style={{ width: "100%", height: 280 }}
      role="img"
      aria-label={`Load profile: ${intervals.length} hourly values`}
    >
      <ResponsiveContainer>
        <AreaChart
          data={data}
          margin={{ top: 8, right: 16, bottom: 8, left: 8 }}
        >
          <CartesianGrid stroke="#dcd6ca" strokeDasharray="3 3" />
          <XAxis
            dataKey="t"
            type="number"
            scale="time"
            ticks={ticks}
            domain={["dataMin", "dataMax"]}
            tickFormatter={(t) => dayMonthIn(t, timeZone)}
            stroke="#4f5966"
          />
          <YAxis
            stroke="#4f5966"
            width={64}
            tickFormatter={(v) => formatTick(Number(v))}
            label={{
              value: "kWh",
              angle: -90,
              position: "insideLeft",
              fill: "#4f5966",
            }}
          />
          <Tooltip
            labelFormatter={(t) => dateTimeIn(Number(t), timeZone)}
            formatter={(v) => [`${formatHourKwh(Number(v))} kWh`]}
          />
          <Area
            type="stepAfter"
            dataKey="measured"
            name="Actual"
            stroke={colour.chart}
            fill={colour.tint}
            isAnimationActive={false}
            connectNulls={false}
          />
          <Area
            type="stepAfter"
            dataKey="other"
            name="Estimated or corrected"
            stroke="#7a4b00"
            fill="#fdf4e3"
            isAnimationActive={false}
            connectNulls={false}
          />
        </AreaChart>
      </ResponsiveContainer>
    </div>
  );
}

/** Local midnights, thinned to about ten, so each tick names one day. */
function midnightTicks(intervals: Interval[], timeZone: string): number[] {
  const midnights = intervals
    .map((i) => new Date(i.start))
    .filter((d) => localParts(d, timeZone).hour === 0)
    .map((d) => d.getTime());
  const step = Math.max(1, Math.ceil(midnights.length / 10));
  return midnights.filter((_, i) => i % step === 0);
}
