/**
 * Ledger figures in another unit without binary rounding. The ledger's kWh
 * are exact decimal text (PostgreSQL numeric); converting them through a JS
 * number would turn 1234.567891 kWh into 4.444444407600001 GJ. Here they are
 * converted in decimal arithmetic, with the factors of ledger-units.ts:
 *
 * - into kWh, MWh and GJ the quotient ends (a decimal shift, or × 0.0036),
 *   so the result is exact to the last digit;
 * - into therms and MMBtu, and per m² of floor area, it generally does not
 *   end, so it is rounded once, half to even, to ROUNDED_DECIMALS places.
 *
 * Plain module: the grid and the exports share it.
 */
import Decimal from "decimal.js-light";
import { LEDGER_UNITS, type LedgerUnit } from "./ledger-units";

/**
 * Far more significant digits than any ledger figure has: a quotient that
 * ends is computed whole, and one that does not fills them all, which is how
 * the two are told apart (NON_ENDING_PLACES).
 */
const Exact = Decimal.clone({
  precision: 80,
  rounding: Decimal.ROUND_HALF_EVEN,
});

/**
 * Places a quotient that does not end is rounded to: a millionth of a kWh,
 * the ledger's own resolution, is 3.4 × 10⁻⁹ MMBtu, so nothing the ledger
 * holds is lost.
 */
export const ROUNDED_DECIMALS = 9;

/**
 * An exact ledger quotient has at most the figure's 6 places plus the few a
 * factor adds; one that does not end has 80 significant digits, so more than
 * this many places for any figure below 10⁵⁰.
 */
const NON_ENDING_PLACES = 30;

const KWH_MJ = new Exact(LEDGER_UNITS.kWh.megajoules);

function settle(value: Decimal): string {
  const settled =
    value.decimalPlaces() > NON_ENDING_PLACES
      ? value.toDecimalPlaces(ROUNDED_DECIMALS, Decimal.ROUND_HALF_EVEN)
      : value;
  // toFixed() without places writes every digit, never an exponent.
  return settled.isZero() ? "0" : settled.toFixed();
}

/**
 * A kWh figure (exact decimal text) in `unit`, divided by `perM2` square
 * metres when given. Decimal text out, without trailing zeros.
 */
export function convertKwh(
  kwh: string,
  unit: LedgerUnit,
  perM2?: string,
): string {
  let value = new Exact(kwh)
    .times(KWH_MJ)
    .dividedBy(LEDGER_UNITS[unit].megajoules);
  if (perM2 !== undefined) value = value.dividedBy(perM2);
  return settle(value);
}

/** Σ of decimal texts, exactly; "0" for none. */
export function addExact(values: readonly string[]): string {
  return settle(values.reduce((sum, v) => sum.plus(v), new Exact(0)));
}
