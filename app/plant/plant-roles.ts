/**
 * What each kind of plant takes in and gives out, as meter roles, and which
 * carrier a meter in each role must account for. Plain module: the schema's
 * enums, the plant form and the server checks all read these lists.
 */
import type { Carrier } from "../sites/meter-kinds";
import { fuels, type Fuel } from "./fuels";
import { plantKinds, type PlantKind } from "./plant-performance";

export { plantKinds, type PlantKind };

export const plantKindLabels: Record<PlantKind, string> = {
  boiler: "Boiler",
  chp: "Combined heat and power (CHP)",
  heat_pump: "Heat pump",
  chiller: "Chiller",
  fuel_cell: "Fuel cell",
};

export const plantMeterRoles = [
  "fuel_in",
  "electricity_in",
  "heat_out",
  "cooling_out",
  "electricity_out",
] as const;
export type PlantMeterRole = (typeof plantMeterRoles)[number];

export const plantMeterRoleLabels: Record<PlantMeterRole, string> = {
  fuel_in: "Fuel in",
  electricity_in: "Electricity in",
  heat_out: "Heat out",
  cooling_out: "Cooling out",
  electricity_out: "Electricity out",
};

/** The roles a kind of plant needs, every one of them, for its month to be judged. */
export const rolesOf: Record<PlantKind, readonly PlantMeterRole[]> = {
  boiler: ["fuel_in", "heat_out"],
  chp: ["fuel_in", "electricity_out", "heat_out"],
  fuel_cell: ["fuel_in", "electricity_out", "heat_out"],
  heat_pump: ["electricity_in", "heat_out"],
  chiller: ["electricity_in", "cooling_out"],
};

/** The fuel a carrier is, when it is one. */
export function fuelOfCarrier(carrier: string): Fuel | null {
  return (fuels as readonly string[]).includes(carrier)
    ? (carrier as Fuel)
    : null;
}

/** Null when a meter of `carrier` can fill `role`, else the reason. */
export function roleCarrierError(
  role: PlantMeterRole,
  carrier: Carrier,
): string | null {
  const fits: Record<PlantMeterRole, boolean> = {
    fuel_in: fuelOfCarrier(carrier) !== null,
    electricity_in: carrier === "electricity",
    electricity_out: carrier === "electricity",
    heat_out: carrier === "heat",
    cooling_out: carrier === "cooling",
  };
  if (fits[role]) return null;
  const wanted: Record<PlantMeterRole, string> = {
    fuel_in: "a fuel (gas, oil, LPG, biomass or hydrogen)",
    electricity_in: "electricity",
    electricity_out: "electricity",
    heat_out: "heat",
    cooling_out: "cooling",
  };
  return `${plantMeterRoleLabels[role]} needs a meter of ${wanted[role]}; this one measures ${carrier}`;
}

/** Whether a kind of plant delivers heat or cooling into water, and so needs its design temperatures. */
export function needsHeatTemperatures(kind: PlantKind): boolean {
  return rolesOf[kind].includes("heat_out");
}
export function needsChilledTemperatures(kind: PlantKind): boolean {
  return rolesOf[kind].includes("cooling_out");
}
