import type { Interval } from "./use-intervals";

/** The hours shown, their signed total, and how many are estimated, corrected or flagged. */
export function IntervalSummary({ intervals }: { intervals: Interval[] }) {
  const total = intervals.reduce((s, i) => s + Number(i.energy_kwh), 0);
  const estimated = intervals.filter((i) => i.quality === "estimated").length;
  const edited = intervals.filter((i) => i.quality === "edited").length;
  const flagged = intervals.filter((i) => i.flags.length > 0).length;
  const items = [
    ["Hours", intervals.length.toLocaleString("en-GB")],
    [
      "Signed total",
      `${total.toLocaleString("en-GB", { maximumFractionDigits: 1 })} kWh`,
    ],
    [
      "Estimated",
      intervals.length
        ? `${((100 * estimated) / intervals.length).toFixed(1)} %`
        : "—",
    ],
    ["Corrected", String(edited)],
    ["Flagged", String(flagged)],
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 sm:grid-cols-5">
      {items.map(([k, v]) => (
        <div key={k} className="rounded-lg bg-paper px-3 py-2">
          <dt className="text-sm text-ink-muted">{k}</dt>
          <dd className="text-lg font-semibold tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}
