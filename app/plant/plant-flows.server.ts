/**
 * A site's plant in one month as the balance diagram draws it
 * (plant-balance.ts): each plant's meters by role, their energies and
 * whether the month broke a law, from the same monthly rollups the plant
 * page judges.
 */
import type { Carrier } from "~/sites/meter-kinds";
import type { PlantFlow } from "./plant-balance";
import { sitePlantMonths } from "./plant-months.server";
import { listPlants } from "./plants.server";

export async function plantFlowsOfMonth(args: {
  organizationId: string;
  siteId: string;
  /** YYYY-MM */
  month: string;
}): Promise<PlantFlow[]> {
  const plants = await listPlants(args);
  if (plants.length === 0) return [];
  const months = await sitePlantMonths({
    ...args,
    plants,
    within: [args.month],
  });
  return plants.flatMap((plant) => {
    const figures = months.get(plant.id)?.[0];
    if (!figures) return [];
    return [
      {
        plantId: plant.id,
        name: plant.name,
        kind: plant.kind,
        meters: plant.meters.map((m) => ({
          meterId: m.meterId,
          role: m.role,
          carrier: m.carrier as Carrier,
        })),
        energies: figures.energies,
        fault: figures.faults.length > 0,
      },
    ];
  });
}
