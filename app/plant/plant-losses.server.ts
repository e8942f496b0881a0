/**
 * The conversion losses of a site's fuel-burning plant in one month, for the
 * site's balance: fuel in − heat and electricity out, from the same monthly
 * rollups the plant page judges.
 */
import { conversionLoss, type PlantLoss } from "./conversion-loss";
import { sitePlantMonths } from "./plant-months.server";
import { listPlants } from "./plants.server";

export async function plantLossesOfMonth(args: {
  organizationId: string;
  siteId: string;
  month: string;
}): Promise<PlantLoss[]> {
  const plants = await listPlants(args);
  if (plants.length === 0) return [];
  const months = await sitePlantMonths({
    ...args,
    plants,
    within: [args.month],
  });
  return plants.flatMap((plant) => {
    const figures = months.get(plant.id)?.[0];
    const loss = figures ? conversionLoss(plant.kind, figures.energies) : null;
    if (!figures || !loss) return [];
    const { id: plantId, name, kind } = plant;
    return [{ plantId, name, kind, fault: figures.faults.length > 0, ...loss }];
  });
}
