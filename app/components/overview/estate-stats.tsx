import { formatCount, formatPercent } from "~/lib/format";

/** The estate in four figures: sites, actual and estimated shares, meters with no data. */
export function EstateStats({
  sites,
  measuredShare,
  estimatedShare,
  silentHours,
  silentMeters,
}: {
  sites: number;
  /** Of the last 30 days' hours, the share read from meters (0–1). */
  measuredShare: number;
  /** Of the last 30 days' hours, the share estimated (0–1). */
  estimatedShare: number;
  silentHours: number;
  silentMeters: number;
}) {
  const stats = [
    ["Sites", formatCount(sites)],
    ["Actual, last 30 days", formatPercent(measuredShare)],
    ["Estimated, last 30 days", formatPercent(estimatedShare)],
    [`No data over ${silentHours} h`, formatCount(silentMeters)],
  ];
  return (
    <dl className="grid grid-cols-2 gap-4 lg:grid-cols-4">
      {stats.map(([label, value]) => (
        <div
          key={label}
          className="rounded-card border border-line bg-surface p-4 shadow-card"
        >
          <dt className="text-sm text-ink-muted">{label}</dt>
          <dd className="text-2xl font-semibold tabular-nums">{value}</dd>
        </div>
      ))}
    </dl>
  );
}
