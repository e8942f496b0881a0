/**
 * A plant's month as the first and second laws see it: what it took in
 * (fuel, electricity), what it gave out (heat, cooling, electricity), its
 * efficiency or COP, its second-law efficiency, and the checks the laws set.
 * A month that breaks a law is a metering fault on the plant's meters, never
 * a result: the caller flags it and keeps it out of any achievement.
 * Pure: the month's energies and mean temperatures come in as numbers.
 */
import {
  carnotCoolingCop,
  carnotHeatingCop,
  heatExergyKwh,
  kelvin,
  meanTemperatureK,
} from "./carnot";
import { FUEL_RATIOS, grossEnergyKwh, type CvBasis, type Fuel } from "./fuels";

export const plantKinds = [
  "boiler",
  "chp",
  "heat_pump",
  "chiller",
  "fuel_cell",
] as const;
export type PlantKind = (typeof plantKinds)[number];

export interface PlantMonth {
  kind: PlantKind;
  fuel?: { fuel: Fuel; energyKwh: number; basis: CvBasis };
  electricityInKwh?: number;
  heatOutKwh?: number;
  /** Cooling delivered, ≥ 0. */
  coolingOutKwh?: number;
  electricityOutKwh?: number;
  /**
   * The month's means; the outdoor mean is also the dead state. Without it
   * (no weather for the month) the Carnot and exergy figures are left out.
   */
  temperatures: {
    outdoorC?: number;
    heatFlowC?: number;
    heatReturnC?: number;
    chilledFlowC?: number;
    chilledReturnC?: number;
  };
}

export type PlantFigureKey =
  | "efficiency_gross"
  | "electrical_efficiency_gross"
  | "cop"
  | "eer"
  | "second_law_efficiency";

export interface PlantFigure {
  key: PlantFigureKey;
  /** A ratio (0.92 for 92 %); null when the month lacks what it needs. */
  value: number | null;
}

export interface PlantCheck {
  /** What the law limits, in the figure's own terms. */
  figure: PlantFigureKey;
  measured: number;
  limit: number;
  passed: boolean;
  /** Why the limit holds, for the method note beside a flag. */
  law: string;
}

export interface PlantPerformance {
  figures: PlantFigure[];
  checks: PlantCheck[];
}

const ratio = (out: number, into: number): number | null =>
  into > 0 ? out / into : null;

function fuelGross(month: PlantMonth): number {
  const { fuel } = month;
  return fuel ? grossEnergyKwh(fuel.fuel, fuel.energyKwh, fuel.basis) : 0;
}

/** The most work the month's fuel could give: |ΔG| share of its gross energy. */
function fuelMaxWork(month: PlantMonth): number {
  const { fuel } = month;
  return fuel ? fuelGross(month) * FUEL_RATIOS[fuel.fuel].maxWorkToGross : 0;
}

function heatExergy(month: PlantMonth): number | null {
  const { heatFlowC, heatReturnC, outdoorC } = month.temperatures;
  if (heatFlowC === undefined || heatReturnC === undefined) return null;
  if (outdoorC === undefined) return null;
  return heatExergyKwh(month.heatOutKwh ?? 0, heatFlowC, heatReturnC, outdoorC);
}

function coolingExergy(month: PlantMonth): number | null {
  const { chilledFlowC, chilledReturnC, outdoorC } = month.temperatures;
  if (chilledFlowC === undefined || chilledReturnC === undefined) return null;
  if (outdoorC === undefined) return null;
  return heatExergyKwh(
    month.coolingOutKwh ?? 0,
    chilledFlowC,
    chilledReturnC,
    outdoorC,
  );
}

function check(
  figure: PlantFigureKey,
  measured: number | null,
  limit: number | null,
  law: string,
): PlantCheck[] {
  if (measured === null || limit === null) return [];
  return [{ figure, measured, limit, passed: measured <= limit, law }];
}

const FIRST_LAW_FUEL =
  "first law: what leaves cannot exceed the fuel's gross (higher) calorific energy";
const MAX_WORK =
  "second law: electricity cannot exceed the fuel's maximum work, |ΔG| of its reaction at 25 °C";

function boiler(month: PlantMonth): PlantPerformance {
  const efficiency = ratio(month.heatOutKwh ?? 0, fuelGross(month));
  const exergy = heatExergy(month);
  return {
    figures: [
      { key: "efficiency_gross", value: efficiency },
      {
        key: "second_law_efficiency",
        value: exergy === null ? null : ratio(exergy, fuelMaxWork(month)),
      },
    ],
    checks: check("efficiency_gross", efficiency, 1, FIRST_LAW_FUEL),
  };
}

function cogeneration(month: PlantMonth): PlantPerformance {
  const gross = fuelGross(month);
  const electricity = month.electricityOutKwh ?? 0;
  const overall = ratio(electricity + (month.heatOutKwh ?? 0), gross);
  const electrical = ratio(electricity, gross);
  const exergy = heatExergy(month);
  const maxWorkShare = month.fuel
    ? FUEL_RATIOS[month.fuel.fuel].maxWorkToGross
    : null;
  return {
    figures: [
      { key: "efficiency_gross", value: overall },
      { key: "electrical_efficiency_gross", value: electrical },
      {
        key: "second_law_efficiency",
        value:
          exergy === null
            ? null
            : ratio(electricity + exergy, fuelMaxWork(month)),
      },
    ],
    checks: [
      ...check("efficiency_gross", overall, 1, FIRST_LAW_FUEL),
      ...check(
        "electrical_efficiency_gross",
        electrical,
        maxWorkShare,
        MAX_WORK,
      ),
    ],
  };
}

function heatPump(month: PlantMonth): PlantPerformance {
  const cop = ratio(month.heatOutKwh ?? 0, month.electricityInKwh ?? 0);
  const { heatFlowC, heatReturnC, outdoorC } = month.temperatures;
  const exergy = heatExergy(month);
  const limit =
    heatFlowC === undefined ||
    heatReturnC === undefined ||
    outdoorC === undefined
      ? null
      : carnotHeatingCop(
          meanTemperatureK(heatFlowC, heatReturnC) - kelvin(0),
          outdoorC,
        );
  return {
    figures: [
      { key: "cop", value: cop },
      {
        key: "second_law_efficiency",
        value:
          exergy === null ? null : ratio(exergy, month.electricityInKwh ?? 0),
      },
    ],
    checks: check(
      "cop",
      cop,
      limit,
      "second law: a heat pump's COP cannot exceed the Carnot COP between the outdoor air and the water's mean temperature",
    ),
  };
}

function chiller(month: PlantMonth): PlantPerformance {
  const eer = ratio(month.coolingOutKwh ?? 0, month.electricityInKwh ?? 0);
  const { chilledFlowC, chilledReturnC, outdoorC } = month.temperatures;
  const exergy = coolingExergy(month);
  const limit =
    chilledFlowC === undefined ||
    chilledReturnC === undefined ||
    outdoorC === undefined
      ? null
      : carnotCoolingCop(
          meanTemperatureK(chilledFlowC, chilledReturnC) - kelvin(0),
          outdoorC,
        );
  return {
    figures: [
      { key: "eer", value: eer },
      {
        key: "second_law_efficiency",
        value:
          exergy === null ? null : ratio(exergy, month.electricityInKwh ?? 0),
      },
    ],
    checks: check(
      "eer",
      eer,
      limit,
      "second law: a chiller's EER cannot exceed the Carnot COP between the chilled water's mean temperature and the outdoor air",
    ),
  };
}

const byKind: Record<PlantKind, (month: PlantMonth) => PlantPerformance> = {
  boiler,
  chp: cogeneration,
  fuel_cell: cogeneration,
  heat_pump: heatPump,
  chiller,
};

export function plantPerformance(month: PlantMonth): PlantPerformance {
  return byKind[month.kind](month);
}

/** The checks a month fails: each a metering fault to flag on the plant's meters. */
export function failedChecks(performance: PlantPerformance): PlantCheck[] {
  return performance.checks.filter((c) => !c.passed);
}
