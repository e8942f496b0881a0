import { deliveredSign } from "~/ledger/delivered";
import type { Carrier, Orientation } from "~/sites/meter-kinds";
import {
  formatCount,
  formatNumber,
  formatPercent,
  NO_FIGURE,
} from "~/lib/format";
import type { Interval } from "./use-intervals";

/**
 * The hours' energy as the meter's role names it: an import meter's
 * delivered energy (chilled water: cooling delivered), an export meter's
 * exported energy, each a positive figure; the hours are stored with the
 * boundary's sign (into the site +).
 */
function deliveredOrExported(
  intervals: Interval[],
  meter: { carrier: Carrier; orientation: Orientation },
): [label: string, kwh: number] {
  const net = intervals.reduce((s, i) => s + Number(i.energy_kwh), 0);
  return meter.orientation === "export"
    ? ["Exported", -net]
    : ["Delivered", deliveredSign(meter.carrier) * net];
}

/** The intervals shown (at the meter's resolution), their delivered or exported total, and how many are estimated, corrected or flagged. */
export function IntervalSummary({
  intervals,
  meter,
}: {
  intervals: Interval[];
  meter: {
    carrier: Carrier;
    orientation: Orientation;
    intervalMinutes: number;
  };
}) {
  const [totalLabel, total] = deliveredOrExported(intervals, meter);
  const estimated = intervals.filter((i) => i.quality === "estimated").length;
  const edited = intervals.filter((i) => i.quality === "edited").length;
  const flagged = intervals.filter((i) => i.flags.length > 0).length;
  const items = [
    [
      meter.intervalMinutes === 60 ? "Hours" : "Intervals",
      formatCount(intervals.length),
    ],
    // Tenths, not the ledger's whole kWh: a few hours' worth must still show.
    [totalLabel, `${formatNumber(total, 1)} kWh`],
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
