// Energy baselines: energy regressed on degree days by ordinary least
// squares, E = a + b·DD, with the goodness-of-fit statistics of ASHRAE
// Guideline 14-2014 (Measurement of Energy, Demand, and Water Savings), the
// avoided energy use of IPMVP (EVO 10000-1:2016) and ratio EnPIs in the
// sense of ISO 50006.
//
// Conventions, stated because summaries of Guideline 14 differ on both:
//   CV(RMSE) = 100 · √(Σ(yᵢ − ŷᵢ)² / (n − p)) / ȳ
//   NMBE     = 100 · Σ(yᵢ − ŷᵢ) / ((n − p) · ȳ)
// with y measured, ŷ the model, and p = 2 parameters (intercept and slope):
// the divisor is n − p, not n, and NMBE is positive when the measured energy
// lies above the model (the model under-predicts). Some secondary summaries
// divide by n and take (ŷ − y), which flips the sign.

import { linearRegression, rSquared } from "simple-statistics";
import type { DegreeDayDriver } from "./degree-days";

/** One period of the baseline: its degree days and its energy. */
export interface BaselinePoint {
  /** Degree days of the period, K·day. */
  dd: number;
  /** Energy of the period, kWh (a magnitude: what was imported). */
  kwh: number;
}

export interface LinearModel {
  /** kWh per K·day. */
  slope: number;
  /** kWh per period at zero degree days (base load). */
  intercept: number;
}

/** Model parameters: intercept and slope. */
export const MODEL_PARAMETERS = 2;

export interface FitStatistics {
  n: number;
  /** Number of model parameters in the n − p divisor. */
  p: number;
  /** Coefficient of determination; null when the energy does not vary. */
  r2: number | null;
  /** %, divisor n − p; null when the mean energy is not above zero. */
  cvrmse: number | null;
  /** %, Σ(measured − model) over (n − p)·mean; null as for CV(RMSE). */
  nmbe: number | null;
  /** √(Σ(y − ŷ)² / (n − p)), kWh. */
  rmse: number;
  meanKwh: number;
}

export type Granularity = "monthly" | "daily";

/**
 * The calibration criteria of ASHRAE Guideline 14 for monthly and for hourly
 * data (CV(RMSE) ≤ 15 % and |NMBE| ≤ 5 % monthly; ≤ 30 % and ≤ 10 % hourly).
 * Daily baselines are held to the hourly criteria: the guideline states no
 * separate daily pair, and this is the product's choice.
 */
export const GUIDELINE_14: Record<
  Granularity,
  { cvrmse: number; nmbe: number }
> = {
  monthly: { cvrmse: 15, nmbe: 5 },
  daily: { cvrmse: 30, nmbe: 10 },
};

export function predict(model: LinearModel, dd: number): number {
  return model.intercept + model.slope * dd;
}

/**
 * Guideline 14 statistics of any straight-line model on the points, with the
 * n − p divisor (p = 2 by default). Needs more points than parameters.
 */
export function goodnessOfFit(
  points: readonly BaselinePoint[],
  model: LinearModel,
  p: number = MODEL_PARAMETERS,
): FitStatistics {
  const n = points.length;
  if (n <= p)
    throw new RangeError(`need more than ${p} points for ${p} parameters`);
  const meanKwh = points.reduce((s, q) => s + q.kwh, 0) / n;
  let sse = 0;
  let bias = 0;
  for (const q of points) {
    const residual = q.kwh - predict(model, q.dd);
    sse += residual * residual;
    bias += residual;
  }
  const rmse = Math.sqrt(sse / (n - p));
  const sst = points.reduce((s, q) => s + (q.kwh - meanKwh) ** 2, 0);
  const r2 =
    sst > 0
      ? rSquared(
          points.map((q) => [q.dd, q.kwh]),
          (x) => predict(model, x),
        )
      : null;
  const meaningful = meanKwh > 0;
  return {
    n,
    p,
    r2,
    cvrmse: meaningful ? (100 * rmse) / meanKwh : null,
    nmbe: meaningful ? (100 * bias) / ((n - p) * meanKwh) : null,
    rmse,
    meanKwh,
  };
}

export interface FittedModel extends LinearModel, FitStatistics {}

export type FitOutcome =
  { ok: true; model: FittedModel } | { ok: false; reason: string };

/** Ordinary least squares of energy on degree days, with its statistics. */
export function fitBaseline(points: readonly BaselinePoint[]): FitOutcome {
  if (points.length <= MODEL_PARAMETERS)
    return {
      ok: false,
      reason: `A baseline needs at least ${MODEL_PARAMETERS + 1} periods with both degree days and energy; there are ${points.length}.`,
    };
  if (points.some((q) => !Number.isFinite(q.dd) || !Number.isFinite(q.kwh)))
    return { ok: false, reason: "Every period needs finite figures." };
  const first = points[0].dd;
  if (points.every((q) => q.dd === first))
    return {
      ok: false,
      reason:
        "The degree days are the same in every period, so energy cannot be regressed on them.",
    };
  const { m, b } = linearRegression(points.map((q) => [q.dd, q.kwh]));
  const line = { slope: m, intercept: b };
  return { ok: true, model: { ...line, ...goodnessOfFit(points, line) } };
}

/**
 * A baseline should see a whole year. With fewer than twelve months it has
 * missed part of the heating or cooling season, so its line rests on a
 * narrow range of degree days and the months it never saw are extrapolated,
 * however closely it fits the months it has: CV(RMSE) and NMBE measure only
 * those. IPMVP asks for a baseline period that spans a full operating cycle,
 * a year for weather-driven energy [memory: IPMVP Core Concepts 2016,
 * baseline period]. So a short baseline carries a warning whatever its
 * statistics.
 */
export const FULL_YEAR_MONTHS = 12;

/** Distinct calendar months among the periods a baseline was fitted on. */
export function monthsFitted(points: readonly { month: string }[]): number {
  return new Set(points.map((p) => p.month.slice(0, 7))).size;
}

/** The warning a baseline of fewer than twelve months carries, else null. */
export function shortBaselineWarning(
  points: readonly { month: string }[],
): string | null {
  const months = monthsFitted(points);
  if (months >= FULL_YEAR_MONTHS) return null;
  return (
    `Fitted on ${months} month${months === 1 ? "" : "s"}, fewer than the ` +
    `${FULL_YEAR_MONTHS} of a full year: the seasons it has not seen are ` +
    `extrapolated, so treat the savings it gives with caution, however well ` +
    `it fits the months it has.`
  );
}

export interface Assessment {
  value: number | null;
  limit: number;
  pass: boolean;
}

/** The fit against the Guideline 14 criteria for its granularity. */
export function assessFit(
  stats: Pick<FitStatistics, "cvrmse" | "nmbe">,
  granularity: Granularity,
): { cvrmse: Assessment; nmbe: Assessment } {
  const limits = GUIDELINE_14[granularity];
  return {
    cvrmse: {
      value: stats.cvrmse,
      limit: limits.cvrmse,
      pass: stats.cvrmse !== null && stats.cvrmse <= limits.cvrmse,
    },
    nmbe: {
      value: stats.nmbe,
      limit: limits.nmbe,
      pass: stats.nmbe !== null && Math.abs(stats.nmbe) <= limits.nmbe,
    },
  };
}

/** One reporting period: its degree days and the energy metered. */
export interface ReportingPeriod {
  dd: number;
  actualKwh: number;
}

export interface AvoidedEnergy {
  /** The baseline restated to the reporting periods' degree days, kWh. */
  adjustedBaselineKwh: number;
  /** Energy metered in the reporting periods, kWh. */
  reportingKwh: number;
  /** Adjusted baseline − reporting energy: positive when less was used. */
  avoidedKwh: number;
  /** Avoided energy as a share of the adjusted baseline, %; null if none. */
  avoidedPercent: number | null;
  periods: number;
}

/**
 * Avoided energy use (IPMVP): adjusted-baseline energy − reporting-period
 * energy, the baseline restated to each reporting period's degree days.
 */
export function avoidedEnergy(
  model: LinearModel,
  reportingPeriod: readonly ReportingPeriod[],
): AvoidedEnergy {
  let adjustedBaselineKwh = 0;
  let reportingKwh = 0;
  for (const r of reportingPeriod) {
    adjustedBaselineKwh += predict(model, r.dd);
    reportingKwh += r.actualKwh;
  }
  const avoidedKwh = adjustedBaselineKwh - reportingKwh;
  return {
    adjustedBaselineKwh,
    reportingKwh,
    avoidedKwh,
    avoidedPercent:
      adjustedBaselineKwh > 0 ? (100 * avoidedKwh) / adjustedBaselineKwh : null,
    periods: reportingPeriod.length,
  };
}

/**
 * Ratio EnPIs (ISO 50006): energy per degree day and energy per m² of floor
 * area, each null where its denominator is not above zero.
 */
export function ratioEnpis(args: {
  kwh: number;
  degreeDays: number;
  floorAreaM2: number | null;
}): { kwhPerDegreeDay: number | null; kwhPerM2: number | null } {
  return {
    kwhPerDegreeDay: args.degreeDays > 0 ? args.kwh / args.degreeDays : null,
    kwhPerM2:
      args.floorAreaM2 !== null && args.floorAreaM2 > 0
        ? args.kwh / args.floorAreaM2
        : null,
  };
}

/** What a saved baseline keeps in its model column. */
export interface StoredModel extends FittedModel {
  method: "ols";
  driver: DegreeDayDriver;
  baseC: number;
  granularity: Granularity;
  /** The periods the model was fitted on. */
  points: { month: string; dd: number; kwh: number }[];
}
