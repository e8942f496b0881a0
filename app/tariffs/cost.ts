/**
 * The cost of one supply in one site-local month, from its intervals and the
 * tariff versions in force, in exact decimals (decimal.js-light at 60
 * digits: sums and products of decimal text never round).
 *
 * - Energy: each interval is split into its quarter hours (15, 30 or 60
 *   minutes make 1, 2 or 4; the energy splits into exact halves or
 *   quarters); each quarter is priced at the band of its local quarter hour
 *   of the week, under the version in force on its local day. DST needs
 *   nothing special: a 23- or 25-hour day simply has fewer or more quarters.
 * - Delivered energy (> 0) pays the band rate and the per-kWh levies;
 *   exported energy (< 0) is credited at the export rate when the version
 *   has one, otherwise it is neither charged nor credited.
 * - Standing and capacity charges: the day's rate for each local day of the
 *   month a version is in force.
 * - Maximum demand: for each version, the highest demand (kW) of the
 *   quarters it priced, summed over the supply's meters quarter by quarter,
 *   an interval's kW being its kWh × 60 / its minutes; charged at the rate
 *   per kW per month, prorated by the version's days in the month (the only
 *   division: rounded to 6 decimal places, half to even).
 * - VAT: the version's percentage of everything it charged; an export
 *   credit carries no VAT.
 */
import Decimal from "decimal.js-light";
import type { BandWeek } from "./band-week";
import { DAY_MS, QUARTER_MS, localQuarter } from "./local-time";
import type { TariffRates } from "./tariff-schema";

const Exact = Decimal.clone({
  precision: 60,
  rounding: Decimal.ROUND_HALF_EVEN,
});
type Exact = InstanceType<typeof Exact>;

/** Money figures that come from a division keep this many places. */
export const PRORATED_PLACES = 6;

export interface PricedVersion {
  validFrom: string;
  /** The last day included, or null. */
  validTo: string | null;
  rates: TariffRates;
  week: BandWeek;
}

export interface SupplyInterval {
  startMs: number;
  minutes: number;
  /** Delivered energy of the carrier: > 0 bought, < 0 exported. Decimal text. */
  deliveredKwh: string;
}

export interface VersionParts {
  valid_from: string;
  days: number;
  bands: { name: string; kwh: string; cost: string }[];
  levies: string;
  standing: string;
  capacity: string;
  max_demand_kw: string;
  max_demand: string;
  export_kwh: string;
  export_credit: string;
  vat: string;
  total: string;
}

export interface MonthCostParts {
  cost: string;
  versions: VersionParts[];
  /** Energy no version priced (days without a tariff), kWh. */
  unpriced_kwh: string;
}

function text(value: Exact): string {
  return value.isZero() ? "0" : value.toFixed();
}

function daysOfMonth(month: string): string[] {
  const [y, m] = month.split("-").map(Number);
  const first = Date.UTC(y, m - 1, 1);
  const next = Date.UTC(y, m, 1);
  const days: string[] = [];
  for (let t = first; t < next; t += DAY_MS)
    days.push(new Date(t).toISOString().slice(0, 10));
  return days;
}

function versionOn(versions: readonly PricedVersion[], day: string): number {
  return versions.findIndex(
    (v) => v.validFrom <= day && (v.validTo === null || day <= v.validTo),
  );
}

interface Accumulator {
  bandKwh: Exact[];
  leviedKwh: Exact;
  exportKwh: Exact;
  /** Demand per UTC quarter, summed over the supply's meters. */
  demand: Map<number, Exact>;
  days: number;
}

function emptyAccumulator(bandCount: number): Accumulator {
  return {
    bandKwh: Array.from({ length: bandCount }, () => new Exact(0)),
    leviedKwh: new Exact(0),
    exportKwh: new Exact(0),
    demand: new Map(),
    days: 0,
  };
}

function addInterval(
  accumulators: Accumulator[],
  versions: readonly PricedVersion[],
  timeZone: string,
  interval: SupplyInterval,
): Exact {
  const quarters = interval.minutes / 15;
  const energy = new Exact(interval.deliveredKwh);
  const perQuarter = energy.div(quarters);
  const kw = energy.times(60).div(interval.minutes);
  let unpriced = new Exact(0);
  for (let q = 0; q < quarters; q++) {
    const at = interval.startMs + q * QUARTER_MS;
    const local = localQuarter(timeZone, at);
    const v = versionOn(versions, local.day);
    if (v < 0) {
      unpriced = unpriced.plus(perQuarter);
      continue;
    }
    const acc = accumulators[v];
    if (perQuarter.isNegative()) {
      acc.exportKwh = acc.exportKwh.plus(perQuarter);
      continue;
    }
    const band = versions[v].week[local.weekQuarter];
    acc.bandKwh[band] = acc.bandKwh[band].plus(perQuarter);
    acc.leviedKwh = acc.leviedKwh.plus(perQuarter);
    const key = Math.floor(at / QUARTER_MS);
    acc.demand.set(key, (acc.demand.get(key) ?? new Exact(0)).plus(kw));
  }
  return unpriced;
}

function versionParts(
  version: PricedVersion,
  acc: Accumulator,
  monthDays: number,
): VersionParts {
  const r = version.rates;
  const bands = r.bands.map((b, i) => ({
    name: b.name,
    kwh: acc.bandKwh[i],
    cost: acc.bandKwh[i].times(b.rate_per_kwh),
  }));
  const levyRate = r.levies.reduce(
    (sum, l) => sum.plus(l.rate_per_kwh),
    new Exact(0),
  );
  const levies = acc.leviedKwh.times(levyRate);
  const standing = new Exact(r.standing_charge_per_day).times(acc.days);
  const capacity = new Exact(r.capacity_charge_per_day).times(acc.days);
  let maxKw = new Exact(0);
  for (const kw of acc.demand.values()) if (kw.gt(maxKw)) maxKw = kw;
  const mdFull = maxKw.times(r.max_demand_rate_per_kw_month);
  const maxDemand =
    acc.days === monthDays
      ? mdFull
      : mdFull
          .times(acc.days)
          .div(monthDays)
          .toDecimalPlaces(PRORATED_PLACES, Decimal.ROUND_HALF_EVEN);
  const exportCredit =
    r.export_rate_per_kwh === null
      ? new Exact(0)
      : acc.exportKwh.times(r.export_rate_per_kwh);
  const charged = bands
    .reduce((sum, b) => sum.plus(b.cost), new Exact(0))
    .plus(levies)
    .plus(standing)
    .plus(capacity)
    .plus(maxDemand);
  const vat = charged.times(r.vat_percent).div(100);
  return {
    valid_from: version.validFrom,
    days: acc.days,
    bands: bands.map((b) => ({
      name: b.name,
      kwh: text(b.kwh),
      cost: text(b.cost),
    })),
    levies: text(levies),
    standing: text(standing),
    capacity: text(capacity),
    max_demand_kw: text(maxKw),
    max_demand: text(maxDemand),
    export_kwh: text(acc.exportKwh),
    export_credit: text(exportCredit),
    vat: text(vat),
    total: text(charged.plus(vat).plus(exportCredit)),
  };
}

/** The month's cost of a supply: its parts by version and their exact sum. */
export function monthCost(input: {
  timeZone: string;
  /** YYYY-MM, site-local. */
  month: string;
  versions: readonly PricedVersion[];
  intervals: readonly SupplyInterval[];
}): MonthCostParts {
  const { timeZone, month, versions } = input;
  const accumulators = versions.map((v) =>
    emptyAccumulator(v.rates.bands.length),
  );
  const days = daysOfMonth(month);
  for (const day of days) {
    const v = versionOn(versions, day);
    if (v >= 0) accumulators[v].days += 1;
  }
  let unpriced = new Exact(0);
  for (const interval of input.intervals)
    unpriced = unpriced.plus(
      addInterval(accumulators, versions, timeZone, interval),
    );
  const parts = versions
    .map((v, i) => ({ v, acc: accumulators[i] }))
    .filter(
      ({ acc }) =>
        acc.days > 0 || acc.demand.size > 0 || !acc.exportKwh.isZero(),
    )
    .map(({ v, acc }) => versionParts(v, acc, days.length));
  const cost = parts.reduce((sum, p) => sum.plus(p.total), new Exact(0));
  return { cost: text(cost), versions: parts, unpriced_kwh: text(unpriced) };
}
