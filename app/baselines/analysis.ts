// Month by month: degree days beside the energy metered, and which months a
// baseline may use. Pure: the server modules fetch, this joins.

import {
  monthsBetween,
  type DegreeDayDriver,
  type MonthlyDegreeDays,
} from "./degree-days";

/** A site's energy of one carrier in one month, from its boundary meters. */
export interface MonthlyEnergy {
  /** YYYY-MM, the site-local month. */
  month: string;
  /** What the import meters measured, as a magnitude, kWh. */
  kwh: number;
  /** The part of it from estimated hours, as a magnitude, kWh. */
  estimatedKwh: number;
}

export interface MonthFigure {
  month: string;
  hdd: number;
  cdd: number;
  /** The degree days the model uses (HDD or CDD). */
  dd: number;
  weatherDays: number;
  daysInMonth: number;
  kwh: number | null;
  estimatedKwh: number;
  /** Complete weather and a ledger entry: the month can enter a fit. */
  usable: boolean;
  /** Why not, when it cannot. */
  note: string | null;
}

export function joinMonths(
  degreeDays: readonly MonthlyDegreeDays[],
  energy: readonly MonthlyEnergy[],
  driver: DegreeDayDriver,
): MonthFigure[] {
  const byMonth = new Map(energy.map((e) => [e.month, e]));
  return degreeDays.map((d) => {
    const e = byMonth.get(d.month);
    const note = !d.complete
      ? d.days === 0
        ? "no weather"
        : `weather for ${d.days} of ${d.daysInMonth} days`
      : !e
        ? "no ledger entry"
        : null;
    return {
      month: d.month,
      hdd: d.hdd,
      cdd: d.cdd,
      dd: driver === "hdd" ? d.hdd : d.cdd,
      weatherDays: d.days,
      daysInMonth: d.daysInMonth,
      kwh: e ? e.kwh : null,
      estimatedKwh: e ? e.estimatedKwh : 0,
      usable: note === null,
      note,
    };
  });
}

/** The usable months of a period, as points for a fit or a savings sum. */
export function pointsIn(
  figures: readonly MonthFigure[],
  period: { from: string; to: string },
): { month: string; dd: number; kwh: number }[] {
  return figures
    .filter(
      (f) =>
        f.usable &&
        f.kwh !== null &&
        f.month >= period.from &&
        f.month <= period.to,
    )
    .map((f) => ({ month: f.month, dd: f.dd, kwh: f.kwh! }));
}

/** Adds or subtracts whole months: shiftMonth("2025-01", -1) = "2024-12". */
export function shiftMonth(month: string, by: number): string {
  const [y, m] = month.split("-").map(Number);
  const d = new Date(Date.UTC(y, m - 1 + by, 1));
  return d.toISOString().slice(0, 7);
}

export function monthCount(from: string, to: string): number {
  return monthsBetween(from, to).length;
}

/**
 * Default periods from the months that have both weather and energy: the
 * last twelve as the reporting period and the twelve before as the
 * baseline; with less than two years, the first twelve months (or all) are
 * the baseline and the rest is reported.
 */
export function defaultPeriods(first: string, last: string) {
  const span = monthCount(first, last);
  if (span >= 24)
    return {
      baseFrom: shiftMonth(last, -23),
      baseTo: shiftMonth(last, -12),
      reportFrom: shiftMonth(last, -11),
      reportTo: last,
    };
  if (span > 12)
    return {
      baseFrom: first,
      baseTo: shiftMonth(first, 11),
      reportFrom: shiftMonth(first, 12),
      reportTo: last,
    };
  return { baseFrom: first, baseTo: last, reportFrom: last, reportTo: last };
}
