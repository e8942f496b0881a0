// What every bench prints beside its figures: the aim and whether it is met,
// then one machine-readable line that tools tracking the figures parse. The
// BENCH lines' shape is fixed (issue #17); change names only with the tools.

/** "met" or "not met", the word the benches print beside each aim. */
export function verdict(met: boolean): string {
  return met ? "met" : "not met";
}

/** One aim line: the figure, the aim beside it and the verdict. */
export function printAim(
  what: string,
  figure: string,
  aim: string,
  met: boolean,
): void {
  console.log(`aim  ${what}: ${figure}; aim ${aim} (${verdict(met)})`);
}

/** A figure as it goes into a BENCH line: plain digits, no grouping. */
function plain(value: number, decimals: number): string {
  return value.toFixed(decimals);
}

/**
 * The closing machine-readable line, e.g.
 * `BENCH readings api_rows_per_s=812 copy_rows_per_s=2345 ratio=0.35`.
 * Integers for counts and milliseconds; a ratio keeps two decimals.
 */
export function printBenchLine(
  bench: string,
  fields: ReadonlyArray<readonly [string, number, number?]>,
): void {
  const parts = fields.map(
    ([key, value, decimals]) => `${key}=${plain(value, decimals ?? 0)}`,
  );
  console.log(`BENCH ${bench} ${parts.join(" ")}`);
}
