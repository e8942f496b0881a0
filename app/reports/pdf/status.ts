/** The closed/provisional statement, on the cover and atop every page. */
import type { ReportData } from "../data/types";

/** "All months closed", or "Provisional: 3 of 12 months open". */
export function statusTitle(
  data: Pick<ReportData, "allMonthsClosed" | "months" | "closedMonths">,
): string {
  if (data.allMonthsClosed) return "All months closed";
  const total = data.months.length;
  const open = total - data.closedMonths;
  return `Provisional: ${open} of ${total} month${total === 1 ? "" : "s"} open`;
}
