import type { ReactNode } from "react";
import { useHydrated } from "~/lib/use-hydrated";

/**
 * What measures the page (a chart) is drawn in the browser only, after
 * hydration; the server's HTML has `fallback` in its place.
 */
export function BrowserOnly({
  children,
  fallback = null,
}: {
  children: ReactNode;
  fallback?: ReactNode;
}) {
  return useHydrated() ? children : fallback;
}
