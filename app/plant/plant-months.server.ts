/**
 * Each plant's months: the energies its meters' monthly rollups give for each
 * role, the site's outdoor mean for the month, and what the laws make of them
 * (plant-performance.ts). Computed on reading, from the rollups as they stand,
 * so a corrected meter clears or raises its plant's flag at once.
 */
import { and, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { monthlyRollups } from "~/db/schema";
import { dailyTemperatures } from "~/baselines/weather.server";
import { deliveredSign } from "~/ledger/delivered";
import type { Carrier } from "~/sites/meter-kinds";
import {
  failedChecks,
  plantPerformance,
  type PlantCheck,
  type PlantMonth,
  type PlantPerformance,
} from "./plant-performance";
import { fuelOfCarrier, rolesOf, type PlantMeterRole } from "./plant-roles";
import type { PlantRow } from "./plants.server";

export interface PlantMonthFigures {
  /** YYYY-MM of the site-local month. */
  month: string;
  /** Energy per role in the month, kWh, as a magnitude (in or out is the role's). */
  energies: Partial<Record<PlantMeterRole, number>>;
  /** Share of the month's energies that is estimated, 0–1. */
  estimatedShare: number;
  outdoorC: number | null;
  /** Null while a role the kind needs has no data in the month. */
  performance: PlantPerformance | null;
  faults: PlantCheck[];
}

interface RollupRow {
  meterId: string;
  month: string;
  energyKwh: string;
  estimatedKwh: string;
}

/** The rollups of the plants' meters: every month, or only those `within` (YYYY-MM). */
async function plantRollups(
  organizationId: string,
  meterIds: string[],
  within: readonly string[] | undefined,
) {
  if (meterIds.length === 0 || within?.length === 0) return [];
  return db
    .select({
      meterId: monthlyRollups.meterId,
      month: monthlyRollups.month,
      energyKwh: monthlyRollups.energyKwh,
      estimatedKwh: monthlyRollups.estimatedKwh,
    })
    .from(monthlyRollups)
    .where(
      and(
        eq(monthlyRollups.organizationId, organizationId),
        inArray(monthlyRollups.meterId, meterIds),
        within
          ? inArray(
              monthlyRollups.month,
              within.map((m) => `${m}-01`),
            )
          : undefined,
      ),
    );
}

async function monthlyOutdoorMeans(
  organizationId: string,
  siteId: string,
  from: string,
  to: string,
): Promise<Map<string, number>> {
  const days = await dailyTemperatures({ organizationId, siteId, from, to });
  const sums = new Map<string, { total: number; count: number }>();
  for (const d of days) {
    const month = d.day.slice(0, 7);
    const s = sums.get(month) ?? { total: 0, count: 0 };
    s.total += d.meanTempC;
    s.count += 1;
    sums.set(month, s);
  }
  return new Map([...sums].map(([m, s]) => [m, s.total / s.count]));
}

const num = (v: string | null) => (v === null ? undefined : Number(v));

/**
 * A role's energy as the plant sees it: the magnitude of its meters' delivered
 * energy. A boiler's heat meter and a CHP's generation meter can face either
 * way across the site's boundary; the role, not the sign, says in or out.
 */
function roleEnergies(
  plant: PlantRow,
  rows: RollupRow[],
): { energies: PlantMonthFigures["energies"]; estimatedShare: number } {
  const energies: PlantMonthFigures["energies"] = {};
  let total = 0;
  let estimated = 0;
  for (const link of plant.meters) {
    for (const row of rows.filter((r) => r.meterId === link.meterId)) {
      const sign = deliveredSign(link.carrier as Carrier);
      energies[link.role] =
        (energies[link.role] ?? 0) + sign * Number(row.energyKwh);
      total += Math.abs(Number(row.energyKwh));
      estimated += Math.abs(Number(row.estimatedKwh));
    }
  }
  for (const role of Object.keys(energies) as PlantMeterRole[])
    energies[role] = Math.abs(energies[role]!);
  return { energies, estimatedShare: total > 0 ? estimated / total : 0 };
}

function judgeMonth(
  plant: PlantRow,
  energies: PlantMonthFigures["energies"],
  outdoorC: number | null,
): PlantPerformance | null {
  if (rolesOf[plant.kind].some((role) => energies[role] === undefined))
    return null;
  const fuelLink = plant.meters.find((m) => m.role === "fuel_in");
  const fuel = fuelLink ? fuelOfCarrier(fuelLink.carrier) : null;
  const month: PlantMonth = {
    kind: plant.kind,
    fuel:
      fuel && energies.fuel_in !== undefined
        ? {
            fuel,
            energyKwh: energies.fuel_in,
            basis: plant.fuelCvBasis === "net" ? "net" : "gross",
          }
        : undefined,
    electricityInKwh: energies.electricity_in,
    heatOutKwh: energies.heat_out,
    coolingOutKwh: energies.cooling_out,
    electricityOutKwh: energies.electricity_out,
    temperatures: {
      outdoorC: outdoorC ?? undefined,
      heatFlowC: num(plant.heatFlowC),
      heatReturnC: num(plant.heatReturnC),
      chilledFlowC: num(plant.chilledFlowC),
      chilledReturnC: num(plant.chilledReturnC),
    },
  };
  return plantPerformance(month);
}

/**
 * Each plant's months with data, newest first: the last `months` (12 by
 * default), or only those of `within` (YYYY-MM), for a report's period.
 */
export async function sitePlantMonths(args: {
  organizationId: string;
  siteId: string;
  plants: PlantRow[];
  months?: number;
  within?: readonly string[];
}): Promise<Map<string, PlantMonthFigures[]>> {
  const meterIds = args.plants.flatMap((p) => p.meters.map((m) => m.meterId));
  const rows = await plantRollups(args.organizationId, meterIds, args.within);
  const monthsWithData = [...new Set(rows.map((r) => r.month.slice(0, 7)))]
    .sort()
    .reverse()
    .slice(0, args.within ? undefined : (args.months ?? 12));
  const outdoor = monthsWithData.length
    ? await monthlyOutdoorMeans(
        args.organizationId,
        args.siteId,
        monthsWithData.at(-1)!,
        monthsWithData[0],
      )
    : new Map<string, number>();
  const result = new Map<string, PlantMonthFigures[]>();
  for (const plant of args.plants) {
    const figures = monthsWithData.map((month) => {
      const ofMonth = rows.filter((r) => r.month.startsWith(month));
      const { energies, estimatedShare } = roleEnergies(plant, ofMonth);
      const outdoorC = outdoor.get(month) ?? null;
      const performance = judgeMonth(plant, energies, outdoorC);
      return {
        month,
        energies,
        estimatedShare,
        outdoorC,
        performance,
        faults: performance ? failedChecks(performance) : [],
      };
    });
    result.set(plant.id, figures);
  }
  return result;
}
