/**
 * A site's plant in one month as its balance draws it, from the same monthly
 * rollups the plant page judges: each plant's meters by role with their
 * energies and whether the month broke a law (plant-balance.ts), and the
 * conversion losses of the fuel-burning ones, fuel in − heat and
 * electricity out (conversion-loss.ts). One read of the plants and their
 * months serves both.
 */
import type { Carrier } from "~/sites/meter-kinds";
import { conversionLoss, type PlantLoss } from "./conversion-loss";
import type { PlantFlow } from "./plant-balance";
import { sitePlantMonths } from "./plant-months.server";
import { listPlants } from "./plants.server";

export interface PlantMonth {
  flows: PlantFlow[];
  losses: PlantLoss[];
}

export async function plantMonthOfSite(args: {
  organizationId: string;
  siteId: string;
  /** YYYY-MM */
  month: string;
}): Promise<PlantMonth> {
  const plants = await listPlants(args);
  if (plants.length === 0) return { flows: [], losses: [] };
  const months = await sitePlantMonths({
    ...args,
    plants,
    within: [args.month],
  });
  const flows: PlantFlow[] = [];
  const losses: PlantLoss[] = [];
  for (const plant of plants) {
    const figures = months.get(plant.id)?.[0];
    if (!figures) continue;
    const { id: plantId, name, kind } = plant;
    const fault = figures.faults.length > 0;
    flows.push({
      plantId,
      name,
      kind,
      meters: plant.meters.map((m) => ({
        meterId: m.meterId,
        role: m.role,
        carrier: m.carrier as Carrier,
      })),
      energies: figures.energies,
      fault,
    });
    const loss = conversionLoss(kind, figures.energies);
    if (loss) losses.push({ plantId, name, kind, fault, ...loss });
  }
  return { flows, losses };
}
