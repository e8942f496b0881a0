/**
 * The demo's carbon: an illustrative emission-factor set for 2024–2026 for
 * every carrier, a zero-carbon contract on one electricity supply (so the
 * market-based figures differ from the location-based ones), and a
 * financial year starting in April. Each part goes in only if absent.
 *
 * The factors are NOT an official publication: they are values of the right
 * order, written from memory for the demo, and their source says so.
 */
import { and, eq } from "drizzle-orm";
import { db } from "../app/db/client.server";
import {
  emissionContracts,
  emissionFactorSets,
  meters,
  organizations,
} from "../app/db/schema";
import { scopeOfCarrier } from "../app/carbon/factor-schema";
import type { Carrier } from "../app/sites/meter-kinds";

export const DEMO_FACTOR_SOURCE =
  "Illustrative demo factors, not an official publication: values of the right order written from memory";
export const DEMO_CONTRACT_METER = "CH-EL1";
export const DEMO_FINANCIAL_YEAR_START = 4;

/** kg CO₂e per kWh: location-based, market-based residual mix, scope 3 (illustrative). */
type Factors = [location: string, market: string | null, scope3: string | null];

const ILLUSTRATIVE: Record<number, Record<Carrier, Factors>> = {
  2024: {
    electricity: ["0.20705", "0.37000", "0.06400"],
    heat: ["0.17000", null, "0.03600"],
    steam: ["0.19000", null, "0.04000"],
    cooling: ["0.06000", null, "0.01500"],
    natural_gas: ["0.18290", null, "0.03000"],
    gas_oil: ["0.25700", null, "0.06200"],
    kerosene: ["0.24700", null, "0.05200"],
    lpg: ["0.21400", null, "0.02900"],
    biomass: ["0.01150", null, "0.03800"],
    hydrogen: ["0.27000", null, "0.05000"],
  },
  2025: {
    electricity: ["0.17700", "0.36000", "0.05900"],
    heat: ["0.16500", null, "0.03500"],
    steam: ["0.18500", null, "0.03900"],
    cooling: ["0.05500", null, "0.01400"],
    natural_gas: ["0.18296", null, "0.03000"],
    gas_oil: ["0.25700", null, "0.06200"],
    kerosene: ["0.24700", null, "0.05200"],
    lpg: ["0.21400", null, "0.02900"],
    biomass: ["0.01150", null, "0.03800"],
    hydrogen: ["0.26000", null, "0.05000"],
  },
  2026: {
    electricity: ["0.16500", "0.35000", "0.05500"],
    heat: ["0.16000", null, "0.03400"],
    steam: ["0.18000", null, "0.03800"],
    cooling: ["0.05000", null, "0.01300"],
    natural_gas: ["0.18300", null, "0.03000"],
    gas_oil: ["0.25700", null, "0.06200"],
    kerosene: ["0.24700", null, "0.05200"],
    lpg: ["0.21400", null, "0.02900"],
    biomass: ["0.01150", null, "0.03800"],
    hydrogen: ["0.25000", null, "0.05000"],
  },
};

/**
 * Writes the demo's factor sets, contract and financial year directly (the
 * seed runs before the scenario's months are closed, so nothing closed is
 * changed and no adjusting entries are due).
 */
export async function seedCarbon(organizationId: string): Promise<void> {
  const existing = await db
    .select({ id: emissionFactorSets.id })
    .from(emissionFactorSets)
    .where(eq(emissionFactorSets.organizationId, organizationId))
    .limit(1);
  if (existing.length > 0) return;
  await db.transaction(async (tx) => {
    await tx
      .update(organizations)
      .set({ financialYearStartMonth: DEMO_FINANCIAL_YEAR_START })
      .where(eq(organizations.id, organizationId));
    for (const [year, byCarrier] of Object.entries(ILLUSTRATIVE))
      for (const [carrier, [location, market, scope3]] of Object.entries(
        byCarrier,
      ) as [Carrier, Factors][])
        await tx.insert(emissionFactorSets).values({
          organizationId,
          year: Number(year),
          carrier,
          scope: scopeOfCarrier(carrier),
          locationKgPerKwh: location,
          marketKgPerKwh: market,
          scope3KgPerKwh: scope3,
          source: DEMO_FACTOR_SOURCE,
          version: `demo ${year}`,
        });
    const [meter] = await tx
      .select({ id: meters.id })
      .from(meters)
      .where(
        and(
          eq(meters.organizationId, organizationId),
          eq(meters.code, DEMO_CONTRACT_METER),
        ),
      );
    if (meter)
      await tx.insert(emissionContracts).values({
        organizationId,
        meterId: meter.id,
        name: "Zero-carbon electricity contract (illustrative)",
        kgPerKwh: "0",
        validFrom: "2024-01-01",
      });
  });
  console.log("[joulebook] demo emission factors seeded");
}
