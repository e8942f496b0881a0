/**
 * What the meter page shows of a tank, and its tank forms' action: the
 * forms go through the same write path as the API (tanks.server.ts).
 */
import { parseForm, type FieldErrors } from "~/lib/forms";
import type { DipPeriod } from "./tank-balance";
import {
  deliveryBody,
  dipBody,
  formFieldOf,
  settingsBody,
  tankDeliveryFormSchema,
  tankDipFormSchema,
  tankSettingsFormSchema,
} from "./tank-forms";
import {
  addTankDelivery,
  addTankDip,
  getTank,
  listTankEntries,
  saveTank,
  TankRuleError,
  tankPeriods,
  type TankMeter,
} from "./tanks.server";

/** Periods shown in the table: the latest. */
const PERIODS_SHOWN = 12;

const periodView = (p: DipPeriod) => ({
  from: p.from.toISOString(),
  to: p.to.toISOString(),
  openingStockL: Number(p.openingStockL),
  deliveriesL: Number(p.deliveriesL),
  closingStockL: Number(p.closingStockL),
  consumptionL: Number(p.consumptionL),
  energyKwh: Number(p.energyKwh),
});

export type TankView = Awaited<ReturnType<typeof tankView>>;

/** The tank's settings, stock history, deliveries and latest periods; null when not a tank. */
export async function tankView(organizationId: string, meterId: string) {
  const tank = await getTank(organizationId, meterId);
  if (!tank) return null;
  const entries = await listTankEntries(organizationId, meterId);
  const periods = tankPeriods(tank, entries);
  return {
    capacityL: Number(tank.capacityL),
    densityKgL: Number(tank.densityKgL),
    calorificValueMjKg: Number(tank.calorificValueMjKg),
    cvBasis: tank.cvBasis,
    dips: entries.dips.map((d) => ({
      at: d.time.toISOString(),
      stockL: Number(d.stockL),
    })),
    deliveries: entries.deliveries.map((d) => ({
      at: d.time.toISOString(),
      volumeL: Number(d.volumeL),
    })),
    periods: periods.slice(-PERIODS_SHOWN).reverse().map(periodView),
  };
}

export interface TankFormResult {
  intent: string;
  errors: FieldErrors;
  message?: string;
}

function refusal(intent: string, error: TankRuleError): TankFormResult {
  const [field] = error.fields;
  const timeField = intent === "tank-dip" ? "dippedAt" : "deliveredAt";
  const key =
    error.fields.length === 1
      ? field === "time"
        ? timeField
        : (formFieldOf[field] ?? "form")
      : "form";
  return { intent, errors: { [key]: error.message } };
}

/** The tank forms' action; refusals go back beside their field. */
export async function tankPageAction(
  intent: string,
  formData: FormData,
  scope: { organizationId: string; actorUserId: string; meter: TankMeter },
): Promise<TankFormResult> {
  const common = {
    organizationId: scope.organizationId,
    meter: scope.meter,
    actor: { actorUserId: scope.actorUserId },
  };
  try {
    if (intent === "tank-settings") {
      const form = parseForm(formData, tankSettingsFormSchema);
      if (!form.ok) return { intent, errors: form.errors };
      await saveTank({ ...common, body: settingsBody(form.data) });
      return { intent, errors: {}, message: "Tank settings saved." };
    }
    if (intent === "tank-dip") {
      const form = parseForm(formData, tankDipFormSchema);
      if (!form.ok) return { intent, errors: form.errors };
      const outcome = await addTankDip({ ...common, body: dipBody(form.data) });
      return {
        intent,
        errors: {},
        message: entered("Dip", outcome.adjustments),
      };
    }
    const form = parseForm(formData, tankDeliveryFormSchema);
    if (!form.ok) return { intent, errors: form.errors };
    const outcome = await addTankDelivery({
      ...common,
      body: deliveryBody(form.data),
    });
    return {
      intent,
      errors: {},
      message: entered("Delivery", outcome.adjustments),
    };
  } catch (error) {
    if (error instanceof TankRuleError) return refusal(intent, error);
    throw error;
  }
}

function entered(what: string, adjustments: number): string {
  return adjustments > 0
    ? `${what} saved; a closed month changed, so ${adjustments} adjusting ${adjustments === 1 ? "entry was" : "entries were"} recorded.`
    : `${what} saved.`;
}
