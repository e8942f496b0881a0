import type { ReactNode } from "react";
import { useInView } from "react-intersection-observer";
import { useHydrated } from "~/lib/use-hydrated";

/**
 * A chart drawn in the browser once any of its box is in the viewport, and
 * kept from then on; until then `fallback` (of the chart's height) holds its
 * place, so nothing moves. A page with many charts below the fold draws
 * only those the reader can see when it loads, and each of the others as
 * it is scrolled to (docs/performance.md, "Pages").
 */
export function WhenInView({
  children,
  height,
}: {
  children: ReactNode;
  /** The chart's height in pixels: the placeholder's until it is drawn. */
  height: number;
}) {
  const hydrated = useHydrated();
  const { ref, inView } = useInView({ triggerOnce: true });
  return (
    // data-when-in-view: "drawn" once drawn; tests scroll to each to read it.
    <div
      ref={ref}
      style={{ minHeight: height }}
      data-when-in-view={hydrated && inView ? "drawn" : "waiting"}
    >
      {hydrated && inView ? children : null}
    </div>
  );
}
