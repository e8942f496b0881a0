import { MONTH_PATTERN, monthCount } from "~/lib/months";
import type { Carrier } from "~/sites/meter-kinds";
import type { DegreeDayDriver } from "./degree-days";

/** A period of at most ten years. */
export const MAX_MONTHS = 120;

export const isDriver = (v: string | null): v is DegreeDayDriver =>
  v === "hdd" || v === "cdd";
/** Cooling follows cooling degree days; every other carrier heating. */
export const defaultDriver = (carrier: Carrier): DegreeDayDriver =>
  carrier === "cooling" ? "cdd" : "hdd";

/** Errors of a from/to pair of months, under the fields' names. */
export function periodErrors(
  from: string,
  to: string,
  names: [string, string],
): Record<string, string> {
  const errors: Record<string, string> = {};
  if (!MONTH_PATTERN.test(from)) errors[names[0]] = "Use a month like 2025-01.";
  if (!MONTH_PATTERN.test(to)) errors[names[1]] = "Use a month like 2025-12.";
  else if (!errors[names[0]] && to < from)
    errors[names[1]] = "The last month comes before the first.";
  else if (!errors[names[0]] && monthCount(from, to) > MAX_MONTHS)
    errors[names[1]] = `Choose at most ${MAX_MONTHS} months.`;
  return errors;
}
