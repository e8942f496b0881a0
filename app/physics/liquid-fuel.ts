// Energy of a liquid fuel burnt (design.md, "Fuels, hydrogen and exergy"):
//
//   E/kWh = L × ρ/(kg/l) × CV/(MJ/kg) / 3.6
//
// L is either a metered volume or what a tank's stock readings and the
// deliveries between them give: consumption = opening + deliveries − closing.
// Stock is a state (it can be read at any instant), deliveries a path (they
// are added up over the period); only the two together say what was used.

import {
  PhysicsInputError,
  requireInRange,
  requireNonNegative,
} from "./errors";

/**
 * Ranges for liquid fuels (common practice; typical values [memory]):
 * - density 0.50–1.10 kg/l: from liquid LPG (propane about 0.51 kg/l at
 *   15 °C) through kerosene (about 0.80), gas oil (about 0.84) and
 *   biodiesel (about 0.88) to heavy fuel oil (up to about 1.01). A density
 *   in kg/m³ (e.g. 840) or g/l is refused.
 * - CV 20–55 MJ/kg: from methanol (about 22.7 gross) through biodiesel
 *   (about 40), heavy fuel oil (about 43), gas oil and kerosene (45.5–46.5)
 *   to LPG (about 50). A CV in kWh/kg (about 12.7 for gas oil) or in MJ/l
 *   typed as MJ/kg for LPG (about 25–26) is caught only in the first case;
 *   the range is a plausibility check, not a fuel identification.
 */
export const LIQUID_FUEL_RANGES = {
  densityKgL: { min: 0.5, max: 1.1 },
  calorificValueMjKg: { min: 20, max: 55 },
} as const;

export interface StockBalance {
  openingStockL: number;
  deliveriesL: number;
  closingStockL: number;
}

export interface LiquidFuelInput {
  /** A metered volume, litres; or `stock`, not both. */
  volumeL?: number;
  stock?: StockBalance;
  densityKgL: number;
  calorificValueMjKg: number;
}

export interface LiquidFuelResult {
  energyKwh: number;
  volumeL: number;
  massKg: number;
}

/** opening + deliveries − closing, refused when negative. */
export function stockConsumptionL(stock: StockBalance): number {
  requireNonNegative("openingStockL", stock.openingStockL);
  requireNonNegative("deliveriesL", stock.deliveriesL);
  requireNonNegative("closingStockL", stock.closingStockL);
  const used = stock.openingStockL + stock.deliveriesL - stock.closingStockL;
  if (used < 0) {
    // No field alone is wrong: one of the three readings is, so all three
    // are named (a missed delivery is the usual cause).
    throw new PhysicsInputError(
      `opening_stock_l + deliveries_l − closing_stock_l = ${used} l is ` +
        "negative: the closing stock exceeds the opening stock plus the " +
        "deliveries (a missed delivery or a misread dip?)",
    );
  }
  return used;
}

function consumedVolumeL(input: LiquidFuelInput): number {
  if (input.volumeL !== undefined && input.stock !== undefined) {
    throw new PhysicsInputError(
      "give volume_l or the stock readings (opening_stock_l, deliveries_l, " +
        "closing_stock_l), not both",
      "volumeL",
    );
  }
  if (input.stock !== undefined) return stockConsumptionL(input.stock);
  if (input.volumeL === undefined) {
    throw new PhysicsInputError(
      "is required, or opening_stock_l, deliveries_l and closing_stock_l",
      "volumeL",
    );
  }
  return requireNonNegative("volumeL", input.volumeL);
}

export function liquidFuelEnergy(input: LiquidFuelInput): LiquidFuelResult {
  const volumeL = consumedVolumeL(input);
  const r = LIQUID_FUEL_RANGES;
  requireInRange("densityKgL", input.densityKgL, r.densityKgL, "kg/l");
  requireInRange(
    "calorificValueMjKg",
    input.calorificValueMjKg,
    r.calorificValueMjKg,
    "MJ/kg",
  );
  const massKg = volumeL * input.densityKgL;
  // 1 kWh = 3.6 MJ exactly (references.md §4).
  return {
    energyKwh: (massKg * input.calorificValueMjKg) / 3.6,
    volumeL,
    massKg,
  };
}
