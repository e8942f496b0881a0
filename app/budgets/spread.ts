/**
 * A year's budget spread over its months, flat or in proportion to weights
 * (the months' degree days), so that the months add up to the budget
 * exactly: the budget is counted in its smallest unit (a millionth of a kWh,
 * a cent) as a BigInt, each month gets its whole share, and the units left
 * over go one each to the months with the largest remainders. Pure.
 */

export type SpreadKind = "flat" | "degree_days";

const DECIMAL = /^(\d+)(?:\.(\d+))?$/;

function toUnits(amount: string, places: number): bigint {
  const match = DECIMAL.exec(amount.trim());
  if (!match) throw new Error(`"${amount}" is not a decimal amount ≥ 0.`);
  const [, whole, fraction = ""] = match;
  if (fraction.length > places)
    throw new Error(`"${amount}" has more than ${places} decimals.`);
  return BigInt(whole + fraction.padEnd(places, "0"));
}

function fromUnits(units: bigint, places: number): string {
  if (places === 0) return units.toString();
  const text = units.toString().padStart(places + 1, "0");
  return `${text.slice(0, -places)}.${text.slice(-places)}`;
}

/**
 * `amount` (decimal text with at most `places` decimals) over `weights.length`
 * months. Weights are numbers ≥ 0 (degree days); all zero, or none given,
 * spreads flat. Returns decimal text with `places` decimals whose sum is
 * `amount` exactly.
 */
export function spreadBudget(
  amount: string,
  months: number,
  places: number,
  weights?: readonly number[],
): string[] {
  if (!Number.isInteger(months) || months < 1)
    throw new Error("A budget is spread over at least one month.");
  if (weights && weights.length !== months)
    throw new Error("One weight a month.");
  const units = toUnits(amount, places);
  // Weights to whole thousandths, so the arithmetic stays in integers.
  const scaled = (weights ?? []).map((w) =>
    BigInt(Math.round(Math.max(0, w) * 1000)),
  );
  const useWeights = scaled.length === months && scaled.some((w) => w > 0n);
  const w = useWeights ? scaled : Array.from({ length: months }, () => 1n);
  const total = w.reduce((s, x) => s + x, 0n);
  const shares = w.map((x) => (units * x) / total);
  const remainders = w.map((x, i) => ({ i, r: (units * x) % total }));
  let left = units - shares.reduce((s, x) => s + x, 0n);
  remainders.sort((a, b) => (b.r > a.r ? 1 : b.r < a.r ? -1 : a.i - b.i));
  for (const { i } of remainders) {
    if (left === 0n) break;
    shares[i] += 1n;
    left -= 1n;
  }
  return shares.map((s) => fromUnits(s, places));
}
