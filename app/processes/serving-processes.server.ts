/**
 * The count of serving processes this process last heard from its primary
 * (serving-count.ts), for the health check.
 */
import { isServingCountMessage } from "./serving-count";

let counted: number | null = null;

process.on("message", (message: unknown) => {
  if (isServingCountMessage(message)) counted = message.count;
});

/**
 * Processes serving on this port: the primary's count, or 1 for a process
 * started on its own (or one that is serving before the count arrived).
 */
export function servingProcesses(): number {
  if (!process.send) return 1;
  return Math.max(1, counted ?? 1);
}
