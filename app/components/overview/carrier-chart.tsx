import {
  Bar,
  BarChart,
  CartesianGrid,
  Legend,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";

export interface CarrierMonth {
  month: string;
  carrier: string;
  net_kwh: number;
}

const colours: Record<string, string> = {
  heat: "#a9501f",
  cooling: "#255f9e",
  steam: "#6a4a9c",
  electricity: "#7a5d00",
};

/** Net energy per month, one bar per carrier, in MWh (signed: cooling below zero). */
export function CarrierChart({ data }: { data: CarrierMonth[] }) {
  const carriers = [...new Set(data.map((d) => d.carrier))];
  const months = [...new Set(data.map((d) => d.month))];
  const rows = months.map((month) => ({
    month,
    ...Object.fromEntries(
      data
        .filter((d) => d.month === month)
        .map((d) => [d.carrier, d.net_kwh / 1000]),
    ),
  }));
  return (
    <div
      style={{ width: "100%", height: 300 }}
      role="img"
      aria-label={`Net energy per month for ${carriers.join(", ")}`}
    >
      <ResponsiveContainer>
        <BarChart
          data={rows}
          margin={{ top: 8, right: 16, bottom: 8, left: 8 }}
        >
          <CartesianGrid stroke="#dcd6ca" strokeDasharray="3 3" />
          <XAxis dataKey="month" stroke="#4f5966" />
          <YAxis
            stroke="#4f5966"
            width={64}
            label={{
              value: "MWh",
              angle: -90,
              position: "insideLeft",
              fill: "#4f5966",
            }}
          />
          <Tooltip
            formatter={(v) =>
              `${Number(v).toLocaleString("en-GB", { maximumFractionDigits: 1 })} MWh`
            }
          />
          <Legend />
          {carriers.map((c) => (
            <Bar
              key={c}
              dataKey={c}
              name={c}
              fill={colours[c] ?? "#4f5966"}
              isAnimationActive={false}
            />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
