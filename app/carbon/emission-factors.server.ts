/**
 * An organisation's emission-factor sets and supply contracts: read, saved
 * (a set replaces the one for its year and carrier) and audited. Every write
 * runs inside withCarbonAdjustments, so what it does to closed months is an
 * adjusting entry, never a silent change.
 */
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db } from "~/db/client.server";
import { emissionContracts, emissionFactorSets, meters } from "~/db/schema";
import { withCarbonAdjustments } from "./carbon-adjustments.server";
import type {
  Contract,
  ContractInput,
  FactorSet,
  FactorSetInput,
} from "./factor-schema";

export interface CarbonActor {
  actorUserId: string | null;
  actorTokenId?: string | null;
}

function factorSetAnswer(
  row: typeof emissionFactorSets.$inferSelect,
): FactorSet {
  return {
    id: row.id,
    year: row.year,
    carrier: row.carrier,
    scope: row.scope === 1 ? 1 : 2,
    location_kg_per_kwh: row.locationKgPerKwh,
    market_kg_per_kwh: row.marketKgPerKwh,
    scope3_kg_per_kwh: row.scope3KgPerKwh,
    source: row.source,
    version: row.version,
    updated_at: row.updatedAt.toISOString(),
  };
}

export async function listFactorSets(
  organizationId: string,
): Promise<FactorSet[]> {
  const rows = await db
    .select()
    .from(emissionFactorSets)
    .where(eq(emissionFactorSets.organizationId, organizationId))
    .orderBy(asc(emissionFactorSets.year), asc(emissionFactorSets.carrier));
  return rows.map(factorSetAnswer);
}

/**
 * The sources behind the factors of some calendar years, for a report's
 * method note: "year carrier: source (version)".
 */
export async function factorSources(
  organizationId: string,
  years: readonly number[],
): Promise<
  Pick<FactorSet, "year" | "carrier" | "source" | "version" | "scope">[]
> {
  if (years.length === 0) return [];
  const rows = await db
    .select()
    .from(emissionFactorSets)
    .where(
      and(
        eq(emissionFactorSets.organizationId, organizationId),
        inArray(emissionFactorSets.year, [...years]),
      ),
    )
    .orderBy(asc(emissionFactorSets.year), asc(emissionFactorSets.carrier));
  return rows.map(factorSetAnswer);
}

/**
 * Saves sets, all or none: each replaces the set of its year and carrier.
 * Returns the saved sets and how many closed meter-months got an adjusting
 * entry.
 */
export async function saveFactorSets(
  organizationId: string,
  actor: CarbonActor,
  sets: readonly FactorSetInput[],
): Promise<{ sets: FactorSet[]; adjusted: number }> {
  return db.transaction(async (tx) => {
    const { result, adjusted } = await withCarbonAdjustments(
      tx,
      organizationId,
      "Emission factors changed after the month was closed",
      async () => {
        const saved: FactorSet[] = [];
        for (const set of sets) {
          const values = {
            scope: set.scope,
            locationKgPerKwh: set.location_kg_per_kwh,
            marketKgPerKwh: set.market_kg_per_kwh,
            scope3KgPerKwh: set.scope3_kg_per_kwh,
            source: set.source,
            version: set.version,
          };
          const [before] = await tx
            .select()
            .from(emissionFactorSets)
            .where(
              and(
                eq(emissionFactorSets.organizationId, organizationId),
                eq(emissionFactorSets.year, set.year),
                eq(emissionFactorSets.carrier, set.carrier),
              ),
            );
          const [row] = await tx
            .insert(emissionFactorSets)
            .values({
              organizationId,
              year: set.year,
              carrier: set.carrier,
              ...values,
            })
            .onConflictDoUpdate({
              target: [
                emissionFactorSets.organizationId,
                emissionFactorSets.year,
                emissionFactorSets.carrier,
              ],
              set: { ...values, updatedAt: sql`now()` },
            })
            .returning();
          saved.push(factorSetAnswer(row));
          await recordAudit(tx, {
            organizationId,
            ...actor,
            action: "emission_factors.saved",
            subject: row.id,
            before: before
              ? {
                  location_kg_per_kwh: before.locationKgPerKwh,
                  market_kg_per_kwh: before.marketKgPerKwh,
                  source: before.source,
                  version: before.version,
                }
              : null,
            after: {
              year: set.year,
              carrier: set.carrier,
              location_kg_per_kwh: set.location_kg_per_kwh,
              market_kg_per_kwh: set.market_kg_per_kwh,
              source: set.source,
              version: set.version,
            },
          });
        }
        return saved;
      },
    );
    return { sets: result, adjusted };
  });
}

export async function listContracts(
  organizationId: string,
): Promise<Contract[]> {
  const rows = await db
    .select({
      id: emissionContracts.id,
      meterId: emissionContracts.meterId,
      meterCode: meters.code,
      name: emissionContracts.name,
      kgPerKwh: emissionContracts.kgPerKwh,
      validFrom: emissionContracts.validFrom,
      validTo: emissionContracts.validTo,
    })
    .from(emissionContracts)
    .innerJoin(
      meters,
      and(
        eq(meters.organizationId, emissionContracts.organizationId),
        eq(meters.id, emissionContracts.meterId),
      ),
    )
    .where(eq(emissionContracts.organizationId, organizationId))
    .orderBy(asc(meters.code), asc(emissionContracts.validFrom));
  return rows.map((r) => ({
    id: r.id,
    meter_id: r.meterId,
    meter_code: r.meterCode,
    name: r.name,
    kg_per_kwh: r.kgPerKwh,
    valid_from: r.validFrom.slice(0, 7),
    valid_to: r.validTo?.slice(0, 7) ?? null,
  }));
}

export class ContractMeterError extends Error {}

/**
 * Adds a contract to a boundary import meter of the organisation (another
 * organisation's meter is "no such meter"); closed months it covers get
 * adjusting entries.
 */
export async function createContract(
  organizationId: string,
  actor: CarbonActor,
  input: ContractInput,
): Promise<{ contract: Contract; adjusted: number }> {
  return db.transaction(async (tx) => {
    const [meter] = await tx
      .select({
        code: meters.code,
        orientation: meters.orientation,
        siteId: meters.siteId,
      })
      .from(meters)
      .where(
        and(
          eq(meters.organizationId, organizationId),
          eq(meters.id, input.meter_id),
        ),
      );
    if (!meter) throw new ContractMeterError("No such meter here.");
    if (meter.orientation !== "import")
      throw new ContractMeterError(
        "A contract is for a supply: an import meter.",
      );
    const { result, adjusted } = await withCarbonAdjustments(
      tx,
      organizationId,
      "Supply contract added after the month was closed",
      async () => {
        const [row] = await tx
          .insert(emissionContracts)
          .values({
            organizationId,
            meterId: input.meter_id,
            name: input.name,
            kgPerKwh: input.kg_per_kwh,
            validFrom: `${input.valid_from}-01`,
            validTo: input.valid_to ? `${input.valid_to}-01` : null,
          })
          .returning();
        return row;
      },
    );
    await recordAudit(tx, {
      organizationId,
      ...actor,
      action: "emission_contract.created",
      subject: result.id,
      siteId: meter.siteId,
      meterId: input.meter_id,
      after: {
        name: input.name,
        kg_per_kwh: input.kg_per_kwh,
        valid_from: input.valid_from,
        valid_to: input.valid_to,
      },
    });
    return {
      contract: {
        id: result.id,
        meter_id: input.meter_id,
        meter_code: meter.code,
        name: input.name,
        kg_per_kwh: result.kgPerKwh,
        valid_from: input.valid_from,
        valid_to: input.valid_to,
      },
      adjusted,
    };
  });
}
