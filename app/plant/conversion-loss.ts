/**
 * A fuel-burning plant's conversion loss in a month: the fuel's energy less
 * what the plant delivered (heat and electricity). Pure.
 *
 * Heat pumps and chillers have none to show: they move ambient heat that no
 * meter measures, so their output rightly exceeds their electricity and a
 * "loss" from their meters would be meaningless.
 */
import type { PlantKind, PlantMeterRole } from "./plant-roles";

const BURNS_FUEL: readonly PlantKind[] = ["boiler", "chp", "fuel_cell"];

export interface ConversionLoss {
  fuelInKwh: number;
  outputsKwh: number;
  /** fuel in − outputs, kWh; negative only when a meter is at fault. */
  lossKwh: number;
}

/** Null for plant that burns no fuel, or while a role has no month's data. */
export function conversionLoss(
  kind: PlantKind,
  energies: Partial<Record<PlantMeterRole, number>>,
): ConversionLoss | null {
  if (!BURNS_FUEL.includes(kind)) return null;
  const fuelInKwh = energies.fuel_in;
  const heatOut = energies.heat_out;
  if (fuelInKwh === undefined || heatOut === undefined) return null;
  const electricityOut = energies.electricity_out;
  if (kind !== "boiler" && electricityOut === undefined) return null;
  const outputsKwh = heatOut + (electricityOut ?? 0);
  return { fuelInKwh, outputsKwh, lossKwh: fuelInKwh - outputsKwh };
}

/** A plant's month as the site's balance lists it. */
export interface PlantLoss extends ConversionLoss {
  plantId: string;
  name: string;
  kind: PlantKind;
  /** The month broke a law: the loss is a meter's fault, not the plant's. */
  fault: boolean;
}
