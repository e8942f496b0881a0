/**
 * A saved baseline applied to the months of a report, as the Weather &
 * baselines page applies it to a reporting period: each month's degree days
 * (the model's own driver and base temperature) give the expected energy,
 * set against what the boundary import meters measured; over the months
 * with both, the avoided energy use of IPMVP (adjusted baseline − actual).
 * Pure: the server module fetches the baseline, weather and ledger figures.
 */
import {
  monthlyDegreeDays,
  type DailyTemperature,
} from "~/baselines/degree-days";
import {
  assessFit,
  avoidedEnergy,
  predict,
  shortBaselineWarning,
  type StoredModel,
} from "~/baselines/regression";
import type { BaselineComparison, BaselineMonth, Carrier } from "./types";

export interface SavedBaselineRow {
  id: string;
  carrier: Carrier;
  /** YYYY-MM, inclusive. */
  from: string;
  to: string;
  granularity: "monthly" | "daily";
  model: StoredModel;
  createdAt: string;
  createdBy: string | null;
}

export function compareWithBaseline(args: {
  baseline: SavedBaselineRow;
  siteBaseC: number;
  /** YYYY-MM, the report's months in order. */
  months: readonly string[];
  temperatures: readonly DailyTemperature[];
  /** Imported energy per month as a magnitude, kWh; absent: no ledger entry. */
  actualKwh: ReadonlyMap<string, number>;
}): BaselineComparison {
  const { baseline, months } = args;
  const { model } = baseline;
  const degreeDays = monthlyDegreeDays(args.temperatures, model.baseC, {
    from: months[0],
    to: months[months.length - 1],
  });
  const fitted = model.points.map((p) => p.dd);
  const lo = Math.min(...fitted);
  const hi = Math.max(...fitted);
  const rows: BaselineMonth[] = degreeDays.map((d) => {
    const dd = d.complete ? (model.driver === "hdd" ? d.hdd : d.cdd) : null;
    const actual = args.actualKwh.get(d.month) ?? null;
    const expected = dd === null ? null : predict(model, dd);
    const note = !d.complete
      ? d.days === 0
        ? "no weather"
        : `weather for ${d.days} of ${d.daysInMonth} days`
      : actual === null
        ? "no ledger entry"
        : null;
    return {
      month: d.month,
      hdd: d.days > 0 ? d.hdd : null,
      cdd: d.days > 0 ? d.cdd : null,
      dd,
      weatherDays: d.days,
      daysInMonth: d.daysInMonth,
      actualKwh: actual,
      expectedKwh: expected,
      difference:
        actual !== null && expected !== null && expected > 0
          ? (actual - expected) / expected
          : null,
      extrapolated:
        dd !== null && fitted.length > 0 && (dd < lo - 1e-9 || dd > hi + 1e-9),
      note,
    };
  });
  const compared = rows.filter(
    (r) => r.dd !== null && r.actualKwh !== null,
  ) as (BaselineMonth & { dd: number; actualKwh: number })[];
  const avoided = avoidedEnergy(
    model,
    compared.map((r) => ({ dd: r.dd, actualKwh: r.actualKwh })),
  );
  return {
    carrier: baseline.carrier,
    baselineId: baseline.id,
    from: baseline.from,
    to: baseline.to,
    granularity: baseline.granularity,
    driver: model.driver,
    baseC: model.baseC,
    siteBaseC: args.siteBaseC,
    intercept: model.intercept,
    slope: model.slope,
    n: model.n,
    p: model.p,
    r2: model.r2,
    cvrmse: model.cvrmse,
    nmbe: model.nmbe,
    assessment: assessFit(model, baseline.granularity),
    // The same rule as the Weather & baselines page, from the saved periods.
    shortFitWarning: shortBaselineWarning(model.points),
    createdAt: baseline.createdAt,
    createdBy: baseline.createdBy,
    months: rows,
    comparedMonths: compared.length,
    expectedKwh: avoided.adjustedBaselineKwh,
    actualKwh: avoided.reportingKwh,
    avoidedKwh: avoided.avoidedKwh,
    avoidedPercent: avoided.avoidedPercent,
  };
}
