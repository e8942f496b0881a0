/**
 * A gas meter's register and correction settings: read, and set while the
 * meter has no readings (afterwards its stored volumes would no longer match
 * its settings, as a meter's resolution is fixed once it has intervals).
 */
import { and, eq } from "drizzle-orm";
import { recordAudit } from "~/audit/record-audit.server";
import { db } from "~/db/client.server";
import { gasMeterSettings, rawReadings } from "~/db/schema";
import type { CvActor, GasSupplyMeter } from "./calorific-values.server";
import { settingsFromRow } from "./gas-context.server";
import type { GasSettings } from "./gas-intervals";
import type { GasSettingsInput } from "./gas-settings";

export class GasSettingsFixedError extends Error {}

export async function getGasSettings(
  organizationId: string,
  meterId: string,
): Promise<GasSettings> {
  const [row] = await db
    .select()
    .from(gasMeterSettings)
    .where(
      and(
        eq(gasMeterSettings.organizationId, organizationId),
        eq(gasMeterSettings.meterId, meterId),
      ),
    );
  return settingsFromRow(row);
}

const text = (v: number | null) => (v === null ? null : String(v));

export async function saveGasSettings(args: {
  organizationId: string;
  meter: GasSupplyMeter;
  input: GasSettingsInput;
  actor: CvActor;
}): Promise<GasSettings> {
  const { organizationId, meter, input, actor } = args;
  return db.transaction(async (tx) => {
    const [reading] = await tx
      .select({ t: rawReadings.readingTime })
      .from(rawReadings)
      .where(
        and(
          eq(rawReadings.organizationId, organizationId),
          eq(rawReadings.meterId, meter.id),
        ),
      )
      .limit(1);
    if (reading)
      throw new GasSettingsFixedError(
        `Meter ${meter.code} has readings: its register and correction are fixed. Swap the meter to change them.`,
      );
    const values = {
      registerUnit: input.register_unit,
      correctionFactor: text(input.correction_factor),
      gasTempC: text(input.gas_temp_c),
      gasPressureMbarG: text(input.gas_pressure_mbar_g),
      atmosphericPressureMbar: text(input.atmospheric_pressure_mbar),
    };
    await tx
      .insert(gasMeterSettings)
      .values({ organizationId, meterId: meter.id, ...values })
      .onConflictDoUpdate({
        target: [gasMeterSettings.organizationId, gasMeterSettings.meterId],
        set: { ...values, updatedAt: new Date() },
      });
    await recordAudit(tx, {
      organizationId,
      actorUserId: actor.actorUserId,
      actorTokenId: actor.actorTokenId ?? null,
      action: "gas.settings_saved",
      subject: meter.id,
      siteId: meter.siteId,
      meterId: meter.id,
      after: values,
    });
    return settingsFromRow({
      organizationId,
      meterId: meter.id,
      updatedAt: new Date(),
      ...values,
    });
  });
}
