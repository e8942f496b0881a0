/**
 * What ingest needs of each natural-gas meter in a batch: its site's time
 * zone, its register and correction settings, and its supply's CV series.
 * Read once per batch, before the readings are prepared.
 */
import { and, eq, inArray } from "drizzle-orm";
import { db, type Executor } from "~/db/client.server";
import { calorificValues, gasMeterSettings, meters, sites } from "~/db/schema";
import {
  cvLookup,
  type CvEntry,
  type CvPeriodKind,
  type GasRegisterUnit,
} from "./calorific-values";
import {
  NO_GAS_SETTINGS,
  type GasMeterContext,
  type GasSettings,
} from "./gas-intervals";

const num = (v: string | null) => (v === null ? null : Number(v));

type SettingsRow = typeof gasMeterSettings.$inferSelect;

export function settingsFromRow(row: SettingsRow | undefined): GasSettings {
  if (!row) return NO_GAS_SETTINGS;
  return {
    registerUnit: row.registerUnit as GasRegisterUnit | null,
    correctionFactor: num(row.correctionFactor),
    gasTempC: num(row.gasTempC),
    gasPressureMbarG: num(row.gasPressureMbarG),
    atmosphericPressureMbar: num(row.atmosphericPressureMbar),
  };
}

/** The CV series of some meters, by meter id. */
export async function cvSeriesOf(
  organizationId: string,
  meterIds: string[],
  tx: Executor = db,
): Promise<Map<string, CvEntry[]>> {
  const rows = await tx
    .select({
      meterId: calorificValues.meterId,
      kind: calorificValues.periodKind,
      start: calorificValues.periodStart,
      cv: calorificValues.calorificValueMjM3,
      basis: calorificValues.basis,
    })
    .from(calorificValues)
    .where(
      and(
        eq(calorificValues.organizationId, organizationId),
        inArray(calorificValues.meterId, meterIds),
      ),
    );
  const byMeter = new Map<string, CvEntry[]>();
  for (const r of rows) {
    const list = byMeter.get(r.meterId) ?? [];
    list.push({
      kind: r.kind as CvPeriodKind,
      start: r.start,
      cvMjM3: Number(r.cv),
      basis: r.basis as CvEntry["basis"],
    });
    byMeter.set(r.meterId, list);
  }
  return byMeter;
}

/** Gas context of the batch's natural-gas meters, by meter id. */
export async function loadGasContexts(
  organizationId: string,
  batchMeters: readonly { id: string; quantity: string }[],
): Promise<Map<string, GasMeterContext>> {
  const ids = batchMeters
    .filter((m) => m.quantity === "gas_volume")
    .map((m) => m.id);
  const contexts = new Map<string, GasMeterContext>();
  if (ids.length === 0) return contexts;
  const [zones, settings, series] = await Promise.all([
    db
      .select({ id: meters.id, timeZone: sites.timeZone })
      .from(meters)
      .innerJoin(
        sites,
        and(
          eq(sites.organizationId, meters.organizationId),
          eq(sites.id, meters.siteId),
        ),
      )
      .where(
        and(eq(meters.organizationId, organizationId), inArray(meters.id, ids)),
      ),
    db
      .select()
      .from(gasMeterSettings)
      .where(
        and(
          eq(gasMeterSettings.organizationId, organizationId),
          inArray(gasMeterSettings.meterId, ids),
        ),
      ),
    cvSeriesOf(organizationId, ids),
  ]);
  for (const { id, timeZone } of zones) {
    contexts.set(id, {
      timeZone,
      settings: settingsFromRow(settings.find((s) => s.meterId === id)),
      lookup: cvLookup(series.get(id) ?? []),
    });
  }
  return contexts;
}
