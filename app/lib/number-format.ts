/**
 * Figures on pages, in the house style: British grouping ("12,345.6"), a
 * fixed number of decimals per figure, a real minus sign, and a dash where
 * there is no figure.
 */

export const MINUS = "\u2212";
/** What stands where a figure is missing or not a number. */
export const NO_FIGURE = "—";

/** `value` with exactly `digits` decimals, or a dash when there is none. */
export function formatNumber(
  value: number | null | undefined,
  digits = 0,
): string {
  return value === null || value === undefined || !Number.isFinite(value)
    ? NO_FIGURE
    : value.toLocaleString("en-GB", {
        minimumFractionDigits: digits,
        maximumFractionDigits: digits,
      });
}

/** A signed figure with a real minus sign, and no sign on what shows as zero. */
export function formatSigned(value: number, digits = 0): string {
  const text = formatNumber(Math.abs(value), digits);
  if (!/[1-9]/.test(text)) return text;
  return `${value < 0 ? MINUS : "+"}${text}`;
}

/** Energy in whole kWh ("12,345 kWh"), or a dash. */
export function formatKwh(value: number | null): string {
  const text = formatNumber(value);
  return text === NO_FIGURE ? text : `${text} kWh`;
}
