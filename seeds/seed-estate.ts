/**
 * Larchmere's sites, meters and two years of hourly readings. The readings go
 * through the same ingest code as a gateway's batches (checks, physics,
 * intervals, estimates), so the demo shows what the pipeline really makes of
 * gaps, a register roll-over and a meter swap.
 */
import { and, eq } from "drizzle-orm";
import { db } from "../app/db/client.server";
import {
  meters,
  organizations,
  plantMeters,
  plants,
  sites,
  users,
} from "../app/db/schema";
import { closeMonth } from "../app/ledger/month-close.server";
import { ingestReadings } from "../app/ingest/ingest-readings.server";
import { estimationIdle } from "../app/ingest/after-ingest.server";
import { MAX_READINGS_PER_BATCH } from "../app/ingest/reading-schema";
import { formatCount } from "../app/lib/format";
import {
  METERS,
  ORGANIZATION_NAME,
  PLANTS,
  SCENARIO_PERIOD,
  SITES,
} from "./scenario/larchmere-estate";
import { generateReadings } from "./scenario/generate";
import { seedGasSupplies } from "./seed-gas-supplies";
import { seedWeather } from "./seed-weather";
import { seedDepotOilTank } from "./seed-depot-oil-tank";
import { seedCarbon } from "./seed-carbon";
import { seedTariffs } from "./seed-tariffs";
import { seedBudgets } from "./seed-budgets";

async function larchmereId(): Promise<string> {
  const [org] = await db
    .select({ id: organizations.id })
    .from(organizations)
    .where(eq(organizations.name, ORGANIZATION_NAME));
  if (!org) throw new Error("seed the demo organisations first");
  return org.id;
}

/**
 * Invented EN 1434 ratings for the demo's water heat meters (class 2, Δθmin
 * 3 K, a permanent flow sized to the load), so the ledger shows MPE bands.
 */
function heatMeterRating(m: (typeof METERS)[number]) {
  if (m.quantity !== "water_heat") return {};
  const large = ["LP-HX1", "BH-HX0", "CH-HX1", "DR-CW1"].includes(m.code);
  return {
    accuracyClass: 2,
    deltaThetaMinK: "3",
    qpM3PerH: large ? "15" : "6",
  };
}

export async function createEstate(organizationId: string): Promise<boolean> {
  return db.transaction(async (tx) => {
    const existing = await tx
      .select({ id: sites.id })
      .from(sites)
      .where(eq(sites.organizationId, organizationId))
      .limit(1);
    if (existing.length > 0) return false;
    const siteIds = new Map<string, string>();
    for (const s of SITES) {
      const [row] = await tx
        .insert(sites)
        .values({
          organizationId,
          name: s.name,
          timeZone: s.timeZone,
          floorAreaM2: String(s.floorAreaM2),
          degreeDayBaseC: String(s.degreeDayBaseC),
          address: s.address,
        })
        .returning({ id: sites.id });
      siteIds.set(s.name, row.id);
    }
    const meterIds = new Map<string, string>();
    for (const m of METERS) {
      const [row] = await tx
        .insert(meters)
        .values({
          organizationId,
          siteId: siteIds.get(m.siteName)!,
          code: m.code,
          name: m.name,
          quantity: m.quantity,
          carrier: m.carrier,
          orientation: m.orientation,
          position: m.position ?? "boundary",
          serial: m.serial,
          multiplier: String(m.multiplier),
          rolloverKwh:
            m.rolloverKwh === undefined ? null : String(m.rolloverKwh),
          sensorAt: m.sensorAt ?? null,
          defaultPressureBarAbs:
            m.defaultPressureBarAbs === undefined
              ? null
              : String(m.defaultPressureBarAbs),
          installedAt: new Date(m.installedAt),
          removedAt: m.removedAt ? new Date(m.removedAt) : null,
          ...heatMeterRating(m),
        })
        .returning({ id: meters.id });
      meterIds.set(m.code, row.id);
    }
    // Links between meters need both ends to exist first.
    for (const m of METERS) {
      if (!m.parentCode && !m.replacedByCode) continue;
      await tx
        .update(meters)
        .set({
          parentMeterId: m.parentCode ? meterIds.get(m.parentCode)! : null,
          replacedByMeterId: m.replacedByCode
            ? meterIds.get(m.replacedByCode)!
            : null,
        })
        .where(
          and(
            eq(meters.organizationId, organizationId),
            eq(meters.id, meterIds.get(m.code)!),
          ),
        );
    }
    for (const p of PLANTS) {
      const [plant] = await tx
        .insert(plants)
        .values({
          organizationId,
          siteId: siteIds.get(p.siteName)!,
          kind: p.kind,
          name: p.name,
          heatFlowC: String(p.heatFlowC),
          heatReturnC: String(p.heatReturnC),
        })
        .returning({ id: plants.id });
      await tx.insert(plantMeters).values(
        Object.entries(p.meters).map(([role, code]) => ({
          organizationId,
          plantId: plant.id,
          meterId: meterIds.get(code)!,
          role: role as keyof typeof p.meters,
        })),
      );
    }
    await seedGasSupplies(tx, organizationId, meterIds);
    return true;
  });
}

/** Posts the scenario through ingest in gateway-sized batches, in time order. */
async function ingestScenario(
  organizationId: string,
  now: Date,
): Promise<void> {
  const started = Date.now();
  const span = SCENARIO_PERIOD.to.getTime() - SCENARIO_PERIOD.from.getTime();
  let batch: unknown[] = [];
  let total = 0;
  let lastReport = 0;
  const flush = async () => {
    if (batch.length === 0) return;
    const result = await ingestReadings({
      organizationId,
      source: "seed",
      readings: batch,
      now,
    });
    if (result.rejected.length > 0) {
      throw new Error(
        `seed reading rejected: ${JSON.stringify(result.rejected.slice(0, 3))}`,
      );
    }
    total += batch.length;
    batch = [];
  };
  for (const { meter, reading } of generateReadings(SCENARIO_PERIOD)) {
    batch.push({ ...reading, meter });
    if (batch.length < MAX_READINGS_PER_BATCH) continue;
    const at = new Date(
      String(
        (reading as { start?: string; time?: string }).start ??
          (reading as { time?: string }).time,
      ),
    ).getTime();
    await flush();
    const percent = Math.floor(
      (100 * (at - SCENARIO_PERIOD.from.getTime())) / span,
    );
    if (percent >= lastReport + 10) {
      lastReport = percent - (percent % 10);
      console.log(
        `[joulebook] demo readings: ${percent}% (${formatCount(total)} readings, ${Math.round((Date.now() - started) / 1000)} s)`,
      );
    }
  }
  await flush();
  console.log(
    `[joulebook] demo readings: 100% (${formatCount(total)} readings); estimating gaps…`,
  );
  await estimationIdle();
}

/**
 * The demo's energy manager has closed every month of the scenario's first
 * full calendar year, so the Ledger and a year's report show closed figures
 * beside the open months that follow.
 */
async function closeFirstFullYear(organizationId: string): Promise<void> {
  const [manager] = await db
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, "manager@larchmere.example"));
  if (!manager) return;
  const year = SCENARIO_PERIOD.from.getUTCFullYear() + 1;
  for (let m = 1; m <= 12; m++) {
    const outcome = await closeMonth({
      organizationId,
      actorUserId: manager.id,
      month: `${year}-${String(m).padStart(2, "0")}`,
      siteId: null,
    });
    if (!outcome.ok) throw new Error(`closing ${year}-${m}: ${outcome.reason}`);
  }
  console.log(`[joulebook] demo months of ${year} closed`);
}

export async function seedEstate(): Promise<boolean> {
  const organizationId = await larchmereId();
  const created = await createEstate(organizationId);
  await seedCarbon(organizationId);
  // The scenario ends at its own period end; readings are checked as of then.
  if (created) {
    await ingestScenario(organizationId, SCENARIO_PERIOD.to);
    await seedDepotOilTank(organizationId);
    await seedTariffs(organizationId);
    await closeFirstFullYear(organizationId);
  }
  // Weather goes in on the days a site lacks, also into an existing estate.
  await seedWeather(organizationId);
  await seedBudgets(organizationId);
  return created;
}
