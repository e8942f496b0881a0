/**
 * The meter page's gas supply section: what its loader shows (the CV series
 * and the register and correction settings) and what its two forms do
 * (enter one CV; upload a CSV of them). The same rules and writes as the
 * JSON API (calorific-values.server.ts).
 */
import {
  calorificValueInputSchema,
  parseCvCsv,
  type CalorificValueInput,
} from "./calorific-values";
import {
  findGasSupply,
  listCalorificValues,
  saveCalorificValues,
  type CvActor,
} from "./calorific-values.server";
import { settingsCorrection } from "./gas-intervals";
import { getGasSettings } from "./gas-settings.server";

export const GAS_SUPPLY_INTENTS = ["save-cv", "upload-cv"] as const;

export function isGasSupplyMeter(meter: {
  quantity: string;
  carrier: string;
}): boolean {
  return meter.quantity === "gas_volume" && meter.carrier === "natural_gas";
}

export async function gasSupplySection(
  organizationId: string,
  meter: { id: string; quantity: string; carrier: string },
) {
  if (!isGasSupplyMeter(meter)) return null;
  const [values, settings] = await Promise.all([
    listCalorificValues(organizationId, meter.id),
    getGasSettings(organizationId, meter.id),
  ]);
  return {
    values: values.map((v) => ({ ...v, updatedAt: v.updatedAt.toISOString() })),
    settings: {
      ...settings,
      effectiveCorrection: settingsCorrection(settings),
    },
  };
}

export interface GasSupplyResult {
  intent: string;
  errors: Record<string, string>;
  message?: string;
}

/** "calorific_value_mj_m3: must be…" → "Must be…": the field is beside it. */
const plain = (message: string) => {
  const text = message.replace(/^[a-z_0-9]+: /, "");
  return text.charAt(0).toUpperCase() + text.slice(1);
};

const FORM_FIELD: Record<string, string> = {
  period: "period",
  calorific_value_mj_m3: "cv",
  basis: "basis",
  source: "source",
};

function entryFromForm(formData: FormData) {
  const text = (name: string) => String(formData.get(name) ?? "").trim();
  const cv = text("cv");
  return calorificValueInputSchema.safeParse({
    period: text("period"),
    calorific_value_mj_m3: cv === "" ? undefined : Number(cv.replace(",", ".")),
    basis: text("basis") || undefined,
    ...(text("source") ? { source: text("source") } : {}),
  });
}

async function csvEntries(formData: FormData) {
  const file = formData.get("file");
  if (!(file instanceof File) || file.size === 0)
    return { ok: false as const, errors: ["Choose a CSV file."] };
  if (file.size > 200_000)
    return { ok: false as const, errors: ["The file is larger than 200 KB."] };
  return parseCvCsv(await file.text());
}

/** Null when the intent is not the section's. */
export async function gasSupplyAction(args: {
  organizationId: string;
  meterId: string;
  intent: string;
  formData: FormData;
  actor: CvActor;
}): Promise<{ status: number; result: GasSupplyResult } | null> {
  const { intent } = args;
  if (!(GAS_SUPPLY_INTENTS as readonly string[]).includes(intent)) return null;
  const fail = (errors: Record<string, string>) => ({
    status: 400,
    result: { intent, errors },
  });
  const meter = await findGasSupply(args.organizationId, args.meterId).catch(
    () => null,
  );
  if (!meter) return fail({ form: "This meter is not a natural-gas meter." });
  let entries: CalorificValueInput[];
  if (intent === "save-cv") {
    const parsed = entryFromForm(args.formData);
    if (!parsed.success) {
      const errors: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const field = FORM_FIELD[String(issue.path[0])] ?? "form";
        errors[field] ??= plain(issue.message);
      }
      return fail(errors);
    }
    entries = [parsed.data];
  } else {
    const csv = await csvEntries(args.formData);
    if (!csv.ok) return fail({ file: csv.errors.slice(0, 5).join(" ") });
    entries = csv.entries;
  }
  const outcome = await saveCalorificValues({
    organizationId: args.organizationId,
    meter,
    entries,
    actor: args.actor,
  });
  const repriced =
    outcome.intervalsRepriced === 0
      ? ""
      : ` ${outcome.intervalsRepriced} hours were recalculated with it; a closed month shows the change as an adjusting entry.`;
  return {
    status: 200,
    result: {
      intent,
      errors: {},
      message: `${outcome.saved === 1 ? "Calorific value saved." : `${outcome.saved} calorific values saved.`}${repriced}`,
    },
  };
}
