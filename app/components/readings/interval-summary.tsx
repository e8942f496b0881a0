import {
  formatCount,
  formatNumber,
  formatPercent,
  NO_FIGURE,
} from "~/lib/format";
import type { Interval } from "./use-intervals";

/** The hours shown, their signed total, and how many are estimated, corrected or flagged. */
export function IntervalSummary({ intervals }: { intervals: Interval[] }) {
  const total = intervals.reduce((s, i) => s + Number(i.energy_kwh), 0);
  const estimated = intervals.filter((i) => i.quality === "estimated").length;
  const edited = intervals.filter((i) => i.quality === "edited").length;
  const flagged = intervals.filter((i) => i.flags.length > 0).length;
  const items = [
    ["Hours", formatCount(intervals.length)],
    // Tenths, not the ledger's whole kWh: a few hours' worth must still show.
    ["Signed total", `${formatNumber(total, 1)} kWh`],
    [
      "Estimated",
      intervals.length
        ? formatPercent(estimated / intervals.length)
        : NO_FIGURE,
    ],
    ["Corrected", formatCount(edited)],
    ["Flagged", formatCount(flagged)],
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
