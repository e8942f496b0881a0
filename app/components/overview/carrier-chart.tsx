import { CHART } from "~/components/chart-colours";
import {
  Bar,
  BarChart,
  CartesianGrid,
  Legend,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { carrierColour, carrierExportColour } from "~/sites/carrier-colours";
import { carrierLabels, carriers } from "~/sites/meter-kinds";
import { formatMwh } from "~/lib/format";

type Carrier = (typeof carriers)[number];

export interface CarrierMonth {
  month: string;
  carrier: Carrier;
  /** kWh delivered to the estate (≥ 0); chilled water is cooling delivered. */
  delivered_kwh: number;
  /** kWh exported (≤ 0). */
  exported_kwh: number;
}

/**
 * Delivered and exported energy per month in MWh: one column per carrier,
 * delivered above zero and exported below it. Carriers stand side by side,
 * never stacked on each other: unlike carriers are not added.
 */
export function CarrierChart({ data }: { data: CarrierMonth[] }) {
  const present = new Set(data.map((d) => d.carrier));
  const shown = carriers.filter((c) => present.has(c));
  const exporting = new Set(
    data.filter((d) => d.exported_kwh !== 0).map((d) => d.carrier),
  );
  const months = [...new Set(data.map((d) => d.month))];
  const rows = months.map((month) => ({
    month,
    ...Object.fromEntries(
      data
        .filter((d) => d.month === month)
        .flatMap((d) => [
          [`${d.carrier}:delivered`, d.delivered_kwh / 1000],
          [`${d.carrier}:exported`, d.exported_kwh / 1000],
        ]),
    ),
  }));
  const series = shown.flatMap((c) => [
    {
      key: `${c}:delivered`,
      carrier: c,
      name: `${carrierLabels[c]} delivered`,
      fill: carrierColour(c),
    },
    ...(exporting.has(c)
      ? [
          {
            key: `${c}:exported`,
            carrier: c,
            name: `${carrierLabels[c]} exported`,
            fill: carrierExportColour(c),
          },
        ]
      : []),
  ]);
  return (
    <div
      style={{ width: "100%", height: 300 }}
      role="img"
      aria-label={`Energy delivered and exported per month, by carrier: ${shown
        .map((c) => carrierLabels[c].toLowerCase())
        .join(", ")}`}
    >
      <ResponsiveContainer>
        <BarChart
          data={rows}
          stackOffset="sign"
          margin={{ top: 8, right: 16, bottom: 8, left: 8 }}
        >
          <CartesianGrid stroke={CHART.grid} strokeDasharray="3 3" />
          <XAxis dataKey="month" stroke={CHART.ink} />
          <YAxis
            stroke={CHART.ink}
            width={64}
            label={{
              value: "MWh",
              angle: -90,
              position: "insideLeft",
              fill: CHART.ink,
            }}
          />
          <ReferenceLine y={0} stroke={CHART.ink} />
          <Tooltip formatter={(v) => formatMwh(Number(v))} />
          <Legend />
          {series.map((s) => (
            <Bar
              key={s.key}
              dataKey={s.key}
              name={s.name}
              // Delivered and exported of one carrier share a column.
              stackId={s.carrier}
              fill={s.fill}
              isAnimationActive={false}
            />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
