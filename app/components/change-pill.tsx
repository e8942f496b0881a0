import { formatPercent } from "~/lib/format";
import { cx } from "./ui";

/**
 * A change in delivered energy, where less is better: up is red-ish and down
 * green-ish, and the arrow and sign say the direction without the colour.
 * Beyond `tolerance` either way the pill is solid, to stand out.
 */
export function ChangePill({
  change,
  tolerance,
}: {
  /** The change as a fraction (0.12 is +12 %); null when there is nothing to compare. */
  change: number | null;
  tolerance: number;
}) {
  const text = change === null ? "—" : formatPercent(Math.abs(change));
  // Shown as 0.0 %: no direction to colour.
  const direction =
    change === null || text === "0.0 %" ? "none" : change > 0 ? "up" : "down";
  const strong = change !== null && Math.abs(change) > tolerance;
  const styles = {
    up: strong ? "bg-danger-700 text-white" : "bg-danger-50 text-danger-700",
    down: strong ? "bg-spruce-700 text-white" : "bg-spruce-50 text-spruce-800",
    none: "bg-sunken text-ink-muted",
  };
  return (
    <span
      data-direction={direction}
      className={cx(
        "inline-flex items-center gap-1 whitespace-nowrap rounded-full px-2.5 py-0.5 text-sm font-semibold tabular-nums",
        styles[direction],
      )}
    >
      {direction === "none" ? (
        text
      ) : (
        <>
          <span aria-hidden="true">{direction === "up" ? "▲" : "▼"}</span>
          <span className="sr-only">{direction === "up" ? "up" : "down"}</span>
          {`${direction === "up" ? "+" : "−"}${text}`}
        </>
      )}
    </span>
  );
}
