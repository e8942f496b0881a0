/**
 * How a plant's figures and flags read on screens, in alerts and in reports:
 * the trade's words (efficiency on a stated CV basis, COP, EER) and a flag
 * that says which law a month breaks and what to check.
 */
import { formatNumber, formatPercent } from "~/lib/format";
import type { PlantCheck, PlantFigureKey } from "./plant-performance";
import { plantKindLabels, type PlantKind } from "./plant-roles";

export const plantFigureLabels: Record<PlantFigureKey, string> = {
  efficiency_gross: "Efficiency (gross CV)",
  electrical_efficiency_gross: "Electrical efficiency (gross CV)",
  cop: "COP",
  eer: "EER (cooling COP)",
  second_law_efficiency: "Exergy efficiency",
};

/** COP and EER are plain ratios; the efficiencies are percentages. */
export function formatPlantFigure(key: PlantFigureKey, value: number | null) {
  if (key === "cop" || key === "eer")
    return value === null || !Number.isFinite(value)
      ? formatNumber(null, 2)
      : formatNumber(value, 2, { fixed: true });
  return formatPercent(value);
}

const limitWords: Record<PlantFigureKey, string> = {
  efficiency_gross: "more than its fuel's gross energy",
  electrical_efficiency_gross:
    "more electricity than the fuel's maximum work allows",
  cop: "a COP above the Carnot limit for the month's temperatures",
  eer: "an EER above the Carnot limit for the month's temperatures",
  second_law_efficiency: "more work value than went in",
};

/** The flag of a failed check, in the energy manager's words. */
export function plantFaultText(kind: PlantKind, check: PlantCheck): string {
  const plant = plantKindLabels[kind].toLowerCase();
  const measured = formatPlantFigure(check.figure, check.measured);
  const limit = formatPlantFigure(check.figure, check.limit);
  return `Metering fault: ${plantFigureLabels[check.figure]} ${measured}, above the limit of ${limit}. No ${plant} can give ${limitWords[check.figure]}, so a meter on it is reading wrongly; check its meters before using this month.`;
}
