import { monthKey } from "~/lib/months";
import {
  againstBaseline,
  completeness,
  monthlyByCarrier,
  setupProgress,
  silentMeters,
  siteDrift,
} from "~/overview/estate-overview.server";

/** The months a chart of the Overview spans: a year, ending last month. */
const CHART_MONTHS = 12;
/** Actual and estimated shares are of this many days back from now. */
const COMPLETENESS_DAYS = 30;

/**
 * What the Overview page shows of an organisation's estate as of `now`:
 * comparisons are of the last full (UTC) month, the chart spans the year to
 * it, and meters count as without data after `silentHours`.
 */
export async function estateOverview(
  organizationId: string,
  { silentHours, now }: { silentHours: number; now: Date },
) {
  const lastFull = new Date(
    Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1),
  );
  const firstOfChart = new Date(
    Date.UTC(
      lastFull.getUTCFullYear(),
      lastFull.getUTCMonth() - (CHART_MONTHS - 1),
      1,
    ),
  );
  const month = monthKey(lastFull);
  const [setup, drift, silentList, complete, byCarrier, baselines] =
    await Promise.all([
      setupProgress(organizationId),
      siteDrift(organizationId, month),
      silentMeters(organizationId, silentHours, now),
      completeness(organizationId, COMPLETENESS_DAYS, now),
      monthlyByCarrier(organizationId, monthKey(firstOfChart), month),
      againstBaseline(organizationId, month),
    ]);
  return { month, setup, drift, silentList, complete, byCarrier, baselines };
}
