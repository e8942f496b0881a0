import { useSyncExternalStore } from "react";

const subscribeNothing = () => () => {};

/**
 * False on the server and during hydration, true in the browser after: charts
 * and grids that measure the page render only then.
 */
export function useHydrated(): boolean {
  return useSyncExternalStore(
    subscribeNothing,
    () => true,
    () => false,
  );
}
