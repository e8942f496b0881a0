/**
 * The months in which a plant broke a law, across an organisation or a site:
 * what the alerts raise and the reports list under data quality. Each names
 * the plant's meters, since one of them is reading wrongly.
 */
import { and, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { sites } from "~/db/schema";
import { sitePlantMonths, type PlantMonthFigures } from "./plant-months.server";
import { plantKindLabels } from "./plant-roles";
import { plantFaultText } from "./plant-words";
import { listPlants, type PlantRow } from "./plants.server";
import type { PlantFault } from "./plant-fault";

export type { PlantFault };

async function siteNames(organizationId: string, ids: string[]) {
  if (ids.length === 0) return new Map<string, string>();
  const rows = await db
    .select({ id: sites.id, name: sites.name })
    .from(sites)
    .where(
      and(eq(sites.organizationId, organizationId), inArray(sites.id, ids)),
    );
  return new Map(rows.map((r) => [r.id, r.name]));
}

function groupBySite(plants: PlantRow[]): Map<string, PlantRow[]> {
  const bySite = new Map<string, PlantRow[]>();
  for (const p of plants)
    bySite.set(p.siteId, [...(bySite.get(p.siteId) ?? []), p]);
  return bySite;
}

/** A plant's faults in its judged months, each a PlantFault. */
function faultsOf(
  plant: PlantRow,
  months: readonly PlantMonthFigures[],
  siteName: string,
): PlantFault[] {
  return months.flatMap((m) =>
    m.faults.map((check) => ({
      plantId: plant.id,
      plantName: plant.name,
      kind: plant.kind,
      kindLabel: plantKindLabels[plant.kind],
      siteName,
      month: m.month,
      meterCodes: plant.meters.map((l) => l.code),
      text: plantFaultText(plant.kind, check),
    })),
  );
}

/** Every plant fault in the given months (YYYY-MM), oldest month first. */
export async function plantFaults(args: {
  organizationId: string;
  siteId: string | null;
  months: readonly string[];
}): Promise<PlantFault[]> {
  return (await plantChecks(args)).faults;
}

/** How many plants were checked, and the faults found, for a report. */
export async function plantChecks(args: {
  organizationId: string;
  siteId: string | null;
  months: readonly string[];
}): Promise<{ plants: number; faults: PlantFault[] }> {
  const plants = await listPlants(args);
  const bySite = groupBySite(plants);
  // The sites' months are read side by side: a report waits for all of them.
  const [names, monthsBySite] = await Promise.all([
    siteNames(args.organizationId, [...bySite.keys()]),
    Promise.all(
      [...bySite].map(([siteId, sitePlants]) =>
        sitePlantMonths({
          organizationId: args.organizationId,
          siteId,
          plants: sitePlants,
          within: args.months,
        }),
      ),
    ),
  ]);
  const faults: PlantFault[] = [];
  for (const [i, [siteId, sitePlants]] of [...bySite].entries()) {
    const months = monthsBySite[i];
    for (const plant of sitePlants)
      faults.push(
        ...faultsOf(plant, months.get(plant.id) ?? [], names.get(siteId) ?? ""),
      );
  }
  faults.sort(
    (a, b) =>
      a.month.localeCompare(b.month) || a.plantName.localeCompare(b.plantName),
  );
  return { plants: plants.length, faults };
}

/**
 * The faults of the last twelve months with data on the plants a meter
 * serves: shown on the meter's page, since it may be the one reading wrongly.
 */
export async function meterPlantFaults(args: {
  organizationId: string;
  siteId: string;
  meterId: string;
}): Promise<PlantFault[]> {
  const plants = (await listPlants(args)).filter((p) =>
    p.meters.some((m) => m.meterId === args.meterId),
  );
  if (plants.length === 0) return [];
  const months = await sitePlantMonths({ ...args, plants });
  return plants.flatMap((plant) =>
    faultsOf(plant, months.get(plant.id) ?? [], ""),
  );
}
