/**
 * A site's plant: listing it with its meters, adding it (each meter on the
 * same site, of the carrier its role needs) and archiving it.
 */
import { and, asc, eq, inArray, isNull } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db } from "~/db/client.server";
import { isUniqueViolation } from "~/db/errors.server";
import { meters, plantMeters, plants } from "~/db/schema";
import { DuplicateNameError } from "~/sites/sites.server";
import { roleCarrierError, type PlantMeterRole } from "./plant-roles";
import { roleMeters, type PlantForm } from "./plant-schema";

export class PlantRuleError extends Error {
  constructor(
    message: string,
    readonly field: string,
  ) {
    super(message);
  }
}

const plantColumns = {
  id: plants.id,
  siteId: plants.siteId,
  kind: plants.kind,
  name: plants.name,
  fuelCvBasis: plants.fuelCvBasis,
  heatFlowC: plants.heatFlowC,
  heatReturnC: plants.heatReturnC,
  chilledFlowC: plants.chilledFlowC,
  chilledReturnC: plants.chilledReturnC,
};

export type PlantRow = Awaited<ReturnType<typeof listPlants>>[number];

/**
 * Plant in use with the meters on its inputs and outputs: one site's, or
 * (siteId null) the whole organisation's.
 */
export async function listPlants({
  organizationId,
  siteId,
}: {
  organizationId: string;
  siteId: string | null;
}) {
  const rows = await db
    .select(plantColumns)
    .from(plants)
    .where(
      and(
        eq(plants.organizationId, organizationId),
        siteId === null ? undefined : eq(plants.siteId, siteId),
        isNull(plants.archivedAt),
      ),
    )
    .orderBy(asc(plants.name));
  const links = rows.length
    ? await db
        .select({
          plantId: plantMeters.plantId,
          role: plantMeters.role,
          meterId: meters.id,
          code: meters.code,
          carrier: meters.carrier,
        })
        .from(plantMeters)
        .innerJoin(
          meters,
          and(
            eq(meters.organizationId, plantMeters.organizationId),
            eq(meters.id, plantMeters.meterId),
          ),
        )
        .where(
          and(
            eq(plantMeters.organizationId, organizationId),
            inArray(
              plantMeters.plantId,
              rows.map((r) => r.id),
            ),
          ),
        )
    : [];
  return rows.map((plant) => ({
    ...plant,
    meters: links.filter((l) => l.plantId === plant.id),
  }));
}

/** Each named meter must be on the site and fit its role. */
async function checkMeters(
  organizationId: string,
  siteId: string,
  chosen: { role: PlantMeterRole; meterId: string }[],
) {
  const found = await db
    .select({ id: meters.id, siteId: meters.siteId, carrier: meters.carrier })
    .from(meters)
    .where(
      and(
        eq(meters.organizationId, organizationId),
        inArray(
          meters.id,
          chosen.map((c) => c.meterId),
        ),
      ),
    );
  for (const { role, meterId } of chosen) {
    const meter = found.find((m) => m.id === meterId);
    const field = `meter_${role}`;
    if (!meter || meter.siteId !== siteId)
      throw new PlantRuleError("Choose a meter on this site.", field);
    const wrongCarrier = roleCarrierError(role, meter.carrier);
    if (wrongCarrier) throw new PlantRuleError(wrongCarrier, field);
  }
}

export async function createPlant(args: {
  organizationId: string;
  actorUserId: string;
  siteId: string;
  form: PlantForm;
}): Promise<string> {
  const { organizationId, siteId, form } = args;
  const chosen = roleMeters(form);
  await checkMeters(organizationId, siteId, chosen);
  const settings = {
    kind: form.kind,
    name: form.name,
    fuelCvBasis: form.fuelCvBasis,
    heatFlowC: form.heatFlowC?.toString() ?? null,
    heatReturnC: form.heatReturnC?.toString() ?? null,
    chilledFlowC: form.chilledFlowC?.toString() ?? null,
    chilledReturnC: form.chilledReturnC?.toString() ?? null,
  };
  return db
    .transaction(async (tx) => {
      const [plant] = await tx
        .insert(plants)
        .values({ organizationId, siteId, ...settings })
        .returning({ id: plants.id });
      await tx
        .insert(plantMeters)
        .values(
          chosen.map((c) => ({ organizationId, plantId: plant.id, ...c })),
        );
      await recordAudit(tx, {
        organizationId,
        actorUserId: args.actorUserId,
        action: "plant.created",
        subject: plant.id,
        siteId,
        after: { ...settings, meters: chosen },
      });
      return plant.id;
    })
    .catch((error: unknown) => {
      if (isUniqueViolation(error))
        throw new DuplicateNameError(
          "Plant on this site already has this name.",
        );
      throw error;
    });
}

export async function archivePlant(args: {
  organizationId: string;
  actorUserId: string;
  siteId: string;
  plantId: string;
}): Promise<boolean> {
  return db.transaction(async (tx) => {
    const [plant] = await tx
      .update(plants)
      .set({ archivedAt: new Date() })
      .where(
        and(
          eq(plants.organizationId, args.organizationId),
          eq(plants.siteId, args.siteId),
          eq(plants.id, args.plantId),
          isNull(plants.archivedAt),
        ),
      )
      .returning({ name: plants.name });
    if (!plant) return false;
    await recordAudit(tx, {
      organizationId: args.organizationId,
      actorUserId: args.actorUserId,
      action: "plant.archived",
      subject: args.plantId,
      siteId: args.siteId,
      before: { name: plant.name },
    });
    return true;
  });
}
