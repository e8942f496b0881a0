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
import { DAY_MS, QUARTER_MS, dayNumber, localQuarter } from "./local-time";
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

/**
 * Energy is summed as integers of 10⁻⁸ kWh (BigInt): stored energies have 6
 * places, and a quarter of one has at most 8, so every sum is exact and
 * fast; it becomes a decimal once per band and month.
 */
const SCALE_PLACES = 8;
const SCALE = 10n ** BigInt(SCALE_PLACES);

function scaled(text: string): bigint {
  const negative = text.startsWith("-");
  const [whole, fraction = ""] = text.replace(/^[-+]/, "").split(".");
  if (fraction.length > SCALE_PLACES - 2)
    throw new Error(`energy with more than 6 places: ${text}`);
  const value = BigInt(whole + fraction.padEnd(SCALE_PLACES, "0"));
  return negative ? -value : value;
}

function unscaled(value: bigint): Exact {
  return new Exact(value.toString()).div(SCALE.toString());
}

interface DayRange {
  from: number;
  to: number;
}

function versionOn(ranges: readonly DayRange[], day: number): number {
  for (let i = 0; i < ranges.length; i++)
    if (ranges[i].from <= day && day <= ranges[i].to) return i;
  return -1;
}

interface Accumulator {
  bandKwh: bigint[];
  leviedKwh: bigint;
  exportKwh: bigint;
  /** Demand per UTC quarter in 10⁻⁸ kW, summed over the supply's meters. */
  demand: Map<number, bigint>;
  days: number;
}

function emptyAccumulator(bandCount: number): Accumulator {
  return {
    bandKwh: Array.from({ length: bandCount }, () => 0n),
    leviedKwh: 0n,
    exportKwh: 0n,
    demand: new Map(),
    days: 0,
  };
}

function addInterval(
  accumulators: Accumulator[],
  versions: readonly PricedVersion[],
  ranges: readonly DayRange[],
  timeZone: string,
  interval: SupplyInterval,
): bigint {
  const quarters = interval.minutes / 15;
  const energy = scaled(interval.deliveredKwh);
  // Exact: 10⁻⁸ units of a 6-place figure divide by 2 and 4.
  const perQuarter = energy / BigInt(quarters);
  const kw = (energy * 60n) / BigInt(interval.minutes);
  let unpriced = 0n;
  for (let q = 0; q < quarters; q++) {
    const at = interval.startMs + q * QUARTER_MS;
    const local = localQuarter(timeZone, at);
    const v = versionOn(ranges, local.day);
    if (v < 0) {
      unpriced += perQuarter;
      continue;
    }
    const acc = accumulators[v];
    if (perQuarter < 0n) {
      acc.exportKwh += perQuarter;
      continue;
    }
    acc.bandKwh[versions[v].week[local.weekQuarter]] += perQuarter;
    acc.leviedKwh += perQuarter;
    const key = Math.floor(at / QUARTER_MS);
    acc.demand.set(key, (acc.demand.get(key) ?? 0n) + kw);
  }
  return unpriced;
}

function versionParts(
  version: PricedVersion,
  acc: Accumulator,
  monthDays: number,
): VersionParts {
  const r = version.rates;
  const bands = r.bands.map((b, i) => {
    const kwh = unscaled(acc.bandKwh[i]);
    return { name: b.name, kwh, cost: kwh.times(b.rate_per_kwh) };
  });
  const levyRate = r.levies.reduce(
    (sum, l) => sum.plus(l.rate_per_kwh),
    new Exact(0),
  );
  const levies = unscaled(acc.leviedKwh).times(levyRate);
  const standing = new Exact(r.standing_charge_per_day).times(acc.days);
  const capacity = new Exact(r.capacity_charge_per_day).times(acc.days);
  let maxScaled = 0n;
  for (const kw of acc.demand.values()) if (kw > maxScaled) maxScaled = kw;
  const maxKw = unscaled(maxScaled);
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
      : unscaled(acc.exportKwh).times(r.export_rate_per_kwh);
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
    export_kwh: text(unscaled(acc.exportKwh)),
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
  const ranges = versions.map((v) => ({
    from: dayNumber(v.validFrom),
    to: v.validTo === null ? Number.MAX_SAFE_INTEGER : dayNumber(v.validTo),
  }));
  const days = daysOfMonth(month);
  for (const day of days) {
    const v = versionOn(ranges, dayNumber(day));
    if (v >= 0) accumulators[v].days += 1;
  }
  let unpriced = 0n;
  for (const interval of input.intervals)
    unpriced += addInterval(accumulators, versions, ranges, timeZone, interval);
  const parts = versions
    .map((v, i) => ({ v, acc: accumulators[i] }))
    .filter(
      ({ acc }) => acc.days > 0 || acc.demand.size > 0 || acc.exportKwh !== 0n,
    )
    .map(({ v, acc }) => versionParts(v, acc, days.length));
  const cost = parts.reduce((sum, p) => sum.plus(p.total), new Exact(0));
  return {
    cost: text(cost),
    versions: parts,
    unpriced_kwh: text(unscaled(unpriced)),
  };
}
