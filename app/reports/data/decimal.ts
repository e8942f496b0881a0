/**
 * Exact sums and differences of decimal strings (PostgreSQL numeric as
 * text), so a report's totals carry the ledger's digits without binary
 * rounding. Pure.
 */

interface Decimal {
  digits: bigint;
  scale: number;
}

function parse(value: string): Decimal {
  const match = /^([+-]?)(\d*)(?:\.(\d*))?$/.exec(
    value.trim().replace("\u2212", "-"),
  );
  if (!match || (match[2] === "" && !match[3]))
    throw new Error(`Not a decimal number: ${value}`);
  const fraction = match[3] ?? "";
  const digits = BigInt(`${match[2] || "0"}${fraction}`);
  return {
    digits: match[1] === "-" ? -digits : digits,
    scale: fraction.length,
  };
}

function render({ digits, scale }: Decimal): string {
  const negative = digits < 0n;
  const text = (negative ? -digits : digits)
    .toString()
    .padStart(scale + 1, "0");
  const whole = text.slice(0, text.length - scale);
  const fraction = scale > 0 ? `.${text.slice(text.length - scale)}` : "";
  return `${negative ? "-" : ""}${whole}${fraction}`;
}

function combine(values: readonly string[], signs: readonly bigint[]): string {
  const parsed = values.map(parse);
  const scale = Math.max(0, ...parsed.map((d) => d.scale));
  let digits = 0n;
  parsed.forEach((d, i) => {
    digits += signs[i] * d.digits * 10n ** BigInt(scale - d.scale);
  });
  return render({ digits, scale });
}

/** Σ values, exactly; "0" for none. */
export function sumDecimals(values: readonly string[]): string {
  return combine(
    values,
    values.map(() => 1n),
  );
}

/** a − b, exactly. */
export function subtractDecimals(a: string, b: string): string {
  return combine([a, b], [1n, -1n]);
}

/** |value|, exactly. */
export function absDecimal(value: string): string {
  return value.trim().replace(/^[+\-\u2212]/, "");
}
