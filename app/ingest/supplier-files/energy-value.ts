/**
 * One energy cell of a supplier file: kWh in the interval, never negative
 * (an `interval_energy` reading is a magnitude; the meter's orientation gives
 * the sign, shared/design.md "Data in").
 */
import type { Cell } from "./types";

export type EnergyCellResult =
  | { kwh: number }
  | { error: string }
  /** Nothing in the cell: no reading, which is not the same as 0 kWh. */
  | null;

// Plain digits, or digits grouped in threes by commas ("1,234.5", the UK and
// US way of writing thousands), with an optional decimal point and exponent.
const NUMBER_TEXT =
  /^[+-]?(?:\d{1,3}(?:,\d{3})+|\d+)?(?:\.\d+)?(?:[eE][+-]?\d+)?$/;

function refuseNegative(kwh: number, shown: string): EnergyCellResult {
  if (kwh < 0) {
    return {
      error: `${shown} kWh is negative: energy in an interval is given as a positive amount and the meter's orientation (import or export) gives its sign`,
    };
  }
  // -0 would print as "0" but is a sign nobody meant.
  return { kwh: kwh === 0 ? 0 : kwh };
}

export function readEnergyCell(cell: Cell): EnergyCellResult {
  if (cell === null || cell === undefined) return null;
  if (typeof cell === "number") {
    if (!Number.isFinite(cell))
      return { error: `${cell} is not a number of kWh` };
    return refuseNegative(cell, String(cell));
  }
  if (typeof cell !== "string") {
    return { error: `${String(cell)} is not a number of kWh` };
  }
  const text = cell.trim();
  if (text === "") return null;
  if (!NUMBER_TEXT.test(text) || !/\d/.test(text)) {
    const hint = /^[+-]?\d+,\d{1,2}$|^[+-]?\d+,\d{4,}$/.test(text)
      ? ": write decimals with a point (12.5), commas only between thousands (1,234.5)"
      : "";
    return { error: `"${text}" is not a number of kWh${hint}` };
  }
  return refuseNegative(Number(text.replaceAll(",", "")), text);
}
