/**
 * Writes the demo's oil tank (seeds/scenario/depot-oil-tank.ts) into a new
 * estate: the meter at Depot & Laundry, its tank settings, and its dips and
 * deliveries through the app's tank write path.
 */
import { and, eq } from "drizzle-orm";
import { db } from "../app/db/client.server";
import { meters, sites, tanks } from "../app/db/schema";
import { seedTankHistory, type TankMeter } from "../app/tanks/tanks.server";
import { OIL_TANK, oilTankHistory } from "./scenario/depot-oil-tank";
import { SCENARIO_PERIOD, SITE } from "./scenario/larchmere-estate";

/** Adds the tank meter, its settings and its history to a new estate. */
export async function seedDepotOilTank(organizationId: string): Promise<void> {
  const [depot] = await db
    .select({ id: sites.id })
    .from(sites)
    .where(
      and(eq(sites.organizationId, organizationId), eq(sites.name, SITE.depot)),
    );
  if (!depot) return;
  const [meter] = await db
    .insert(meters)
    .values({
      organizationId,
      siteId: depot.id,
      code: OIL_TANK.code,
      name: OIL_TANK.name,
      quantity: "liquid_fuel",
      carrier: "gas_oil",
      orientation: "import",
      serial: "OT-19-5000",
      installedAt: SCENARIO_PERIOD.from,
    })
    .returning();
  await db.insert(tanks).values({
    organizationId,
    meterId: meter.id,
    capacityL: String(OIL_TANK.capacityL),
    densityKgL: OIL_TANK.densityKgL,
    calorificValueMjKg: OIL_TANK.calorificValueMjKg,
  });
  const tankMeter: TankMeter = { ...meter, removedAt: null };
  await seedTankHistory({
    organizationId,
    meter: tankMeter,
    ...oilTankHistory(),
  });
}
