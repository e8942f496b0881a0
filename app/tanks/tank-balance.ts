/**
 * An oil (or LPG) tank's consumption from its stock readings and deliveries
 * (design.md, "Fuels, hydrogen and exergy"; docs/fuels-tanks.md):
 *
 *   consumption between two consecutive dips = opening + deliveries − closing
 *
 * A dip is a state (the litres in the tank at an instant), a delivery a path
 * (litres added over time), so only the two together say what was burnt.
 * The energy of a dip-to-dip period is L × ρ × CV / 3.6 (liquid-fuel.ts),
 * rounded once to the µkWh the intervals store, and shared out over the
 * meter's intervals pro rata by time in whole µkWh: the shares add up to the
 * period's energy exactly, with no rounding left over.
 *
 * Pure and decimal: litres, densities and CVs arrive as decimal text (as
 * PostgreSQL's numeric gives them) and are added with decimal.js-light, so
 * 0.7 + 0.1 − 0.8 is 0, never −1e-16 and a false refusal.
 */
import Decimal from "decimal.js-light";
import { LIQUID_FUEL_RANGES } from "../physics/liquid-fuel";

export type DecimalText = string;

export interface TankDip {
  time: Date;
  stockL: DecimalText;
}

export interface TankDelivery {
  time: Date;
  volumeL: DecimalText;
  /** From the delivery note, when it gives them. */
  densityKgL?: DecimalText | null;
  calorificValueMjKg?: DecimalText | null;
}

/** The fuel's declared properties: the tank's own, used where no note says. */
export interface FuelProperties {
  densityKgL: DecimalText;
  calorificValueMjKg: DecimalText;
}

export interface DipPeriod {
  from: Date;
  to: Date;
  openingStockL: DecimalText;
  deliveriesL: DecimalText;
  closingStockL: DecimalText;
  consumptionL: DecimalText;
  densityKgL: DecimalText;
  calorificValueMjKg: DecimalText;
  /** L × ρ × CV / 3.6, to 6 decimals (what the intervals add up to). */
  energyKwh: DecimalText;
}

/** A refusal that names the fields it concerns, the API's snake_case names. */
export class TankBalanceError extends Error {
  constructor(
    message: string,
    readonly fields: readonly string[],
  ) {
    super(message);
    this.name = "TankBalanceError";
  }
}

/** The three fields a negative consumption names: no one of them alone is wrong. */
export const STOCK_FIELDS = [
  "opening_stock_l",
  "deliveries_l",
  "closing_stock_l",
] as const;

/** Decimal places stored: litres to the ml, energy to the µkWh. */
export const LITRE_DECIMALS = 3;
export const ENERGY_DECIMALS = 6;

const d = (text: DecimalText) => new Decimal(text);

/**
 * A delivery belongs to the period whose closing dip is at or after it:
 * (opening, closing]. A dip taken at the moment a delivery is logged is read
 * as including it; a delivery at the opening dip's instant was already in
 * that dip, so it belongs to the period before.
 */
export function deliveriesWithin(
  deliveries: readonly TankDelivery[],
  from: Date,
  to: Date,
): TankDelivery[] {
  return deliveries.filter(
    (x) =>
      x.time.getTime() > from.getTime() && x.time.getTime() <= to.getTime(),
  );
}

/**
 * opening + deliveries − closing, in litres; refused, naming the three
 * fields, when negative (a missed delivery or a misread dip).
 */
export function stockConsumption(
  openingStockL: DecimalText,
  deliveriesL: DecimalText,
  closingStockL: DecimalText,
): DecimalText {
  const used = d(openingStockL).plus(deliveriesL).minus(closingStockL);
  if (used.isNegative() && !used.isZero()) {
    throw new TankBalanceError(
      `opening_stock_l + deliveries_l − closing_stock_l = ` +
        `${openingStockL} + ${deliveriesL} − ${closingStockL} = ${used.toString().replace("-", "−")} l ` +
        "is negative: the closing stock exceeds the opening stock plus the " +
        "deliveries between them (a missed delivery or a misread dip?)",
      STOCK_FIELDS,
    );
  }
  return used.toFixed(LITRE_DECIMALS);
}

/**
 * The fuel burnt in a period: the latest delivery note at or before the
 * closing dip that states the property, else the tank's declared value. A
 * tank holds a mix; the latest note is the best single figure at hand, and
 * the difference between two notes of one fuel is a fraction of a percent.
 */
export function fuelFor(
  deliveries: readonly TankDelivery[],
  to: Date,
  declared: FuelProperties,
): FuelProperties {
  const before = deliveries
    .filter((x) => x.time.getTime() <= to.getTime())
    .sort((a, b) => b.time.getTime() - a.time.getTime());
  const density = before.find((x) => x.densityKgL)?.densityKgL;
  const cv = before.find((x) => x.calorificValueMjKg)?.calorificValueMjKg;
  return {
    densityKgL: density ?? declared.densityKgL,
    calorificValueMjKg: cv ?? declared.calorificValueMjKg,
  };
}

/** L × ρ/(kg/l) × CV/(MJ/kg) / 3.6, rounded half up to the µkWh. */
export function fuelEnergyKwh(
  litres: DecimalText,
  fuel: FuelProperties,
): DecimalText {
  return d(litres)
    .times(fuel.densityKgL)
    .times(fuel.calorificValueMjKg)
    .dividedBy(3.6)
    .toFixed(ENERGY_DECIMALS, Decimal.ROUND_HALF_UP);
}

function sortedDips(dips: readonly TankDip[]): TankDip[] {
  const sorted = [...dips].sort((a, b) => a.time.getTime() - b.time.getTime());
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i].time.getTime() === sorted[i - 1].time.getTime()) {
      throw new TankBalanceError(
        `two dips at ${sorted[i].time.toISOString()}: a tank has one stock at an instant`,
        ["time"],
      );
    }
  }
  return sorted;
}

/**
 * Every period between consecutive dips, with its consumption and energy.
 * Throws TankBalanceError at the first period whose consumption is negative.
 */
export function dipPeriods(
  dips: readonly TankDip[],
  deliveries: readonly TankDelivery[],
  declared: FuelProperties,
): DipPeriod[] {
  const sorted = sortedDips(dips);
  const periods: DipPeriod[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const opening = sorted[i - 1];
    const closing = sorted[i];
    const delivered = deliveriesWithin(deliveries, opening.time, closing.time)
      .reduce((sum, x) => sum.plus(x.volumeL), new Decimal(0))
      .toFixed(LITRE_DECIMALS);
    const consumptionL = stockConsumption(
      opening.stockL,
      delivered,
      closing.stockL,
    );
    const fuel = fuelFor(deliveries, closing.time, declared);
    periods.push({
      from: opening.time,
      to: closing.time,
      openingStockL: d(opening.stockL).toFixed(LITRE_DECIMALS),
      deliveriesL: delivered,
      closingStockL: d(closing.stockL).toFixed(LITRE_DECIMALS),
      consumptionL,
      ...fuel,
      energyKwh: fuelEnergyKwh(consumptionL, fuel),
    });
  }
  return periods;
}

export interface IntervalShare {
  intervalStart: Date;
  energyKwh: DecimalText;
}

/**
 * Shares `energyKwh` out over the intervals of `stepMs` that [from, to)
 * overlaps, pro rata by the time each overlaps (the tank cannot tell when
 * between two dips the fuel was burnt, so an even rate assumes least). In
 * whole µkWh by the largest-remainder rule: each interval gets the floor of
 * its share, and the µkWh left over go one each to the largest remainders
 * (earliest first on a tie), so the shares add up to the total exactly.
 */
export function spreadOverIntervals(
  from: Date,
  to: Date,
  energyKwh: DecimalText,
  stepMs: number,
): IntervalShare[] {
  const lo = from.getTime();
  const hi = to.getTime();
  if (!(hi > lo)) throw new RangeError("a period must end after it starts");
  const totalMicro = BigInt(
    d(energyKwh)
      .times(10 ** ENERGY_DECIMALS)
      .toFixed(0),
  );
  const span = BigInt(hi - lo);
  const shares: { start: number; micro: bigint; rest: bigint }[] = [];
  for (let t = Math.floor(lo / stepMs) * stepMs; t < hi; t += stepMs) {
    const overlap = BigInt(Math.min(hi, t + stepMs) - Math.max(lo, t));
    const exact = totalMicro * overlap;
    shares.push({ start: t, micro: exact / span, rest: exact % span });
  }
  let left = totalMicro - shares.reduce((n, s) => n + s.micro, 0n);
  const byRemainder = shares
    .map((s, index) => ({ s, index }))
    .sort((a, b) =>
      a.s.rest === b.s.rest ? a.index - b.index : a.s.rest > b.s.rest ? -1 : 1,
    );
  for (const { s } of byRemainder) {
    if (left <= 0n) break;
    s.micro += 1n;
    left -= 1n;
  }
  return shares.map((s) => ({
    intervalStart: new Date(s.start),
    energyKwh: new Decimal(s.micro.toString())
      .dividedBy(10 ** ENERGY_DECIMALS)
      .toFixed(ENERGY_DECIMALS),
  }));
}

/**
 * The intervals of every period, an interval shared by two periods (a dip
 * inside it) holding the sum of its two shares.
 */
export function intervalEnergies(
  periods: readonly DipPeriod[],
  stepMs: number,
): IntervalShare[] {
  const byStart = new Map<number, Decimal>();
  for (const p of periods) {
    if (p.to.getTime() <= p.from.getTime()) continue;
    for (const share of spreadOverIntervals(
      p.from,
      p.to,
      p.energyKwh,
      stepMs,
    )) {
      const t = share.intervalStart.getTime();
      byStart.set(t, (byStart.get(t) ?? new Decimal(0)).plus(share.energyKwh));
    }
  }
  return [...byStart.entries()]
    .sort(([a], [b]) => a - b)
    .map(([t, kwh]) => ({
      intervalStart: new Date(t),
      energyKwh: kwh.toFixed(ENERGY_DECIMALS),
    }));
}

/** Ranges a tank's settings and entries must keep (docs/fuels-tanks.md). */
export const TANK_RANGES = {
  /** Up to 1,000 m³: a large heating-oil tank farm, far above any building's. */
  capacityL: { min: 1, max: 1_000_000 },
  densityKgL: LIQUID_FUEL_RANGES.densityKgL,
  calorificValueMjKg: LIQUID_FUEL_RANGES.calorificValueMjKg,
} as const;
