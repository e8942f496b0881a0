import {
  CartesianGrid,
  Line,
  LineChart,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { CHART } from "~/components/chart-colours";
import { dayUtc, formatNumber, formatTick } from "~/lib/format";

const { ink: INK, grid: GRID, spruce: SPRUCE, danger: DANGER } = CHART;

/**
 * The tank's stock at each dip, with each delivery as a dashed upright line
 * and the capacity as a dashed ceiling; the tables beside it have the
 * figures.
 */
export function TankStockChart({
  dips,
  deliveries,
  capacityL,
}: {
  dips: { at: string; stockL: number }[];
  deliveries: { at: string; volumeL: number }[];
  capacityL: number;
}) {
  const data = dips.map((d) => ({ t: Date.parse(d.at), stock: d.stockL }));
  return (
    <div
      style={{ width: "100%", height: 240 }}
      role="img"
      aria-label="Stock in the tank at each dip, litres, with the deliveries marked"
    >
      <ResponsiveContainer>
        <LineChart
          data={data}
          margin={{ top: 8, right: 8, bottom: 8, left: 8 }}
        >
          <CartesianGrid stroke={GRID} strokeDasharray="3 3" />
          <XAxis
            dataKey="t"
            type="number"
            scale="time"
            domain={["dataMin", "dataMax"]}
            stroke={INK}
            tickFormatter={(t: number) => dayUtc(new Date(t))}
          />
          <YAxis
            stroke={INK}
            width={64}
            domain={[0, Math.ceil(capacityL)]}
            tickFormatter={(v: number) => `${formatTick(v)} l`}
          />
          <Tooltip
            labelFormatter={(t) => dayUtc(new Date(Number(t)))}
            formatter={(v) => [`${formatNumber(Number(v), 0)} l`, "Stock"]}
          />
          <ReferenceLine
            y={capacityL}
            stroke={DANGER}
            strokeDasharray="4 4"
            label={{ value: "Capacity", fill: INK, position: "insideTopRight" }}
          />
          {deliveries.map((d) => (
            <ReferenceLine
              key={d.at}
              x={Date.parse(d.at)}
              stroke={SPRUCE}
              strokeDasharray="2 3"
            />
          ))}
          <Line
            dataKey="stock"
            name="Stock"
            stroke={SPRUCE}
            strokeWidth={2}
            dot={false}
            isAnimationActive={false}
          />
        </LineChart>
      </ResponsiveContainer>
    </div>
  );
}
