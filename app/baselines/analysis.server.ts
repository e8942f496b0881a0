/**
 * Everything the Weather & baselines page shows for one site and carrier:
 * the months of both periods, the model (fitted now, or a saved one), its
 * Guideline 14 assessment, ratio EnPIs and the avoided energy use of the
 * reporting period.
 */
import type { Carrier } from "~/sites/meter-kinds";
import {
  defaultPeriods,
  pointsIn,
  shiftMonth,
  type MonthFigure,
} from "./analysis";
import { siteMonths, type SavedBaseline } from "./baselines.server";
import type { DegreeDayDriver } from "./degree-days";
import { siteCarriers } from "./energy.server";
import {
  assessFit,
  avoidedEnergy,
  fitBaseline,
  predict,
  ratioEnpis,
  type AvoidedEnergy,
  type FittedModel,
} from "./regression";
import { weatherCoverage } from "./weather.server";

export interface Periods {
  baseFrom: string;
  baseTo: string;
  reportFrom: string;
  reportTo: string;
}

const monthOf = (date: Date) => date.toISOString().slice(0, 7);

function firstCompleteMonth(day: string): string {
  return day.endsWith("-01") ? day.slice(0, 7) : shiftMonth(day.slice(0, 7), 1);
}

function lastCompleteMonth(day: string): string {
  const month = day.slice(0, 7);
  const next = new Date(`${day}T00:00:00Z`);
  next.setUTCDate(next.getUTCDate() + 1);
  return monthOf(next) !== month ? month : shiftMonth(month, -1);
}

/**
 * The carriers of a site and default periods: the last full months that
 * have both complete weather and energy, before the current month.
 */
export async function siteDefaults(args: {
  organizationId: string;
  siteId: string;
  carrier: Carrier | null;
  now: Date;
}): Promise<{
  carriers: Carrier[];
  carrier: Carrier | null;
  periods: Periods;
}> {
  const [carriers, coverage] = await Promise.all([
    siteCarriers(args),
    weatherCoverage(args),
  ]);
  const present = carriers.map((c) => c.carrier);
  const carrier =
    args.carrier && present.includes(args.carrier)
      ? args.carrier
      : present.includes("heat")
        ? "heat"
        : (present[0] ?? null);
  const energy = carriers.find((c) => c.carrier === carrier);
  const lastFull = shiftMonth(monthOf(args.now), -1);
  let first: string | null = null;
  let last: string | null = null;
  if (coverage.first && coverage.last && energy?.first && energy.last) {
    first = [firstCompleteMonth(coverage.first), energy.first].sort()[1];
    last = [lastCompleteMonth(coverage.last), energy.last, lastFull].sort()[0];
  }
  const periods =
    first && last && first <= last
      ? defaultPeriods(first, last)
      : defaultPeriods(shiftMonth(lastFull, -23), lastFull);
  return { carriers: present, carrier, periods };
}

export interface MonthlySaving {
  month: string;
  dd: number;
  adjustedKwh: number;
  actualKwh: number;
  avoidedKwh: number;
}

export interface PeriodEnpis {
  months: number;
  kwh: number;
  degreeDays: number;
  kwhPerDegreeDay: number | null;
  kwhPerM2: number | null;
}

export interface Analysis {
  driver: DegreeDayDriver;
  baseC: number;
  baseline: { from: string; to: string };
  reporting: { from: string; to: string };
  months: MonthFigure[];
  basePoints: { month: string; dd: number; kwh: number }[];
  reportPoints: { month: string; dd: number; kwh: number }[];
  model: FittedModel | null;
  modelError: string | null;
  assessment: ReturnType<typeof assessFit> | null;
  savings: (AvoidedEnergy & { months: MonthlySaving[] }) | null;
  /** Reporting months whose degree days lie outside the baseline's range. */
  extrapolated: string[];
  enpis: { baseline: PeriodEnpis; reporting: PeriodEnpis };
}

function enpisOf(
  points: { dd: number; kwh: number }[],
  floorAreaM2: number | null,
): PeriodEnpis {
  const kwh = points.reduce((s, p) => s + p.kwh, 0);
  const degreeDays = points.reduce((s, p) => s + p.dd, 0);
  return {
    months: points.length,
    kwh,
    degreeDays,
    ...ratioEnpis({ kwh, degreeDays, floorAreaM2 }),
  };
}

export async function analyseSite(args: {
  organizationId: string;
  site: { id: string; degreeDayBaseC: string; floorAreaM2: string | null };
  carrier: Carrier;
  driver: DegreeDayDriver;
  periods: Periods;
  saved: SavedBaseline | null;
}): Promise<Analysis> {
  const { saved, periods } = args;
  const driver = saved ? saved.model.driver : args.driver;
  const baseC = saved ? saved.model.baseC : Number(args.site.degreeDayBaseC);
  const baseline = saved
    ? { from: saved.from, to: saved.to }
    : { from: periods.baseFrom, to: periods.baseTo };
  const reporting = { from: periods.reportFrom, to: periods.reportTo };
  const months = await siteMonths({
    organizationId: args.organizationId,
    siteId: args.site.id,
    carrier: args.carrier,
    driver,
    baseC,
    from: [baseline.from, reporting.from].sort()[0],
    to: [baseline.to, reporting.to].sort()[1],
  });
  const basePoints = saved ? saved.model.points : pointsIn(months, baseline);
  const reportPoints = pointsIn(months, reporting);

  let model: FittedModel | null = null;
  let modelError: string | null = null;
  if (saved) model = saved.model;
  else {
    const fit = fitBaseline(basePoints);
    if (fit.ok) model = fit.model;
    else modelError = fit.reason;
  }

  let savings: Analysis["savings"] = null;
  let extrapolated: string[] = [];
  if (model && reportPoints.length > 0) {
    const line = model;
    savings = {
      ...avoidedEnergy(
        line,
        reportPoints.map((p) => ({ dd: p.dd, actualKwh: p.kwh })),
      ),
      months: reportPoints.map((p) => {
        const adjustedKwh = predict(line, p.dd);
        return {
          month: p.month,
          dd: p.dd,
          adjustedKwh,
          actualKwh: p.kwh,
          avoidedKwh: adjustedKwh - p.kwh,
        };
      }),
    };
    const lo = Math.min(...basePoints.map((p) => p.dd));
    const hi = Math.max(...basePoints.map((p) => p.dd));
    extrapolated = reportPoints
      .filter((p) => p.dd < lo - 1e-9 || p.dd > hi + 1e-9)
      .map((p) => p.month);
  }
  const floorArea =
    args.site.floorAreaM2 === null ? null : Number(args.site.floorAreaM2);
  return {
    driver,
    baseC,
    baseline,
    reporting,
    months,
    basePoints,
    reportPoints,
    model,
    modelError,
    assessment: model
      ? assessFit(model, saved ? saved.granularity : "monthly")
      : null,
    savings,
    extrapolated,
    enpis: {
      baseline: enpisOf(basePoints, floorArea),
      reporting: enpisOf(reportPoints, floorArea),
    },
  };
}
