/**
 * The Tariffs page's form: flat fields (three time bands at most, one levy)
 * turned into the API's version input, so the page and the API are checked
 * by the same schema (tariff-schema.ts). Field names of the errors are the
 * form's.
 */
import { z } from "zod";
import type { FieldErrors } from "~/lib/forms";
import {
  tariffVersionInputSchema,
  type TariffVersionInput,
} from "./tariff-schema";

export const BAND_SLOTS = [1, 2, 3] as const;

const text = z.string().trim().max(400).default("");

export const tariffFormSchema = z.strictObject({
  intent: z.literal("add-version"),
  /** "t:<tariffId>" for a supply with a tariff, "n:<siteId>:<carrier>" for a new one. */
  supply: z
    .string()
    .regex(/^(t:[0-9a-f-]{36}|n:[0-9a-f-]{36}:[a-z_]+)$/, "Choose a supply"),
  name: text,
  currency: text,
  validFrom: text,
  validTo: text,
  band1Name: text,
  band1Rate: text,
  band1Windows: text,
  band2Name: text,
  band2Rate: text,
  band2Windows: text,
  band3Name: text,
  band3Rate: text,
  band3Windows: text,
  standing: text,
  capacity: text,
  maxDemand: text,
  levyName: text,
  levyRate: text,
  exportRate: text,
  vatPercent: text,
});
export type TariffForm = z.output<typeof tariffFormSchema>;

/** The API's field → the form's, for errors shown beside their field. */
const fieldOfPath: Record<string, string> = {
  valid_from: "validFrom",
  valid_to: "validTo",
  bands: "bands",
  standing_charge_per_day: "standing",
  capacity_charge_per_day: "capacity",
  max_demand_rate_per_kw_month: "maxDemand",
  levies: "levyRate",
  export_rate_per_kwh: "exportRate",
  vat_percent: "vatPercent",
};

export function versionFromForm(
  form: TariffForm,
):
  { ok: true; input: TariffVersionInput } | { ok: false; errors: FieldErrors } {
  const bands = BAND_SLOTS.map((n) => ({
    name: form[`band${n}Name`],
    rate_per_kwh: form[`band${n}Rate`],
    windows: form[`band${n}Windows`],
  })).filter((b) => b.name || b.rate_per_kwh || b.windows);
  const parsed = tariffVersionInputSchema.safeParse({
    valid_from: form.validFrom,
    valid_to: form.validTo || null,
    rates: {
      bands,
      standing_charge_per_day: form.standing || "0",
      capacity_charge_per_day: form.capacity || "0",
      max_demand_rate_per_kw_month: form.maxDemand || "0",
      levies: form.levyRate
        ? [{ name: form.levyName || "Levy", rate_per_kwh: form.levyRate }]
        : [],
      export_rate_per_kwh: form.exportRate || null,
      vat_percent: form.vatPercent || "0",
    },
  });
  if (parsed.success) return { ok: true, input: parsed.data };
  const errors: FieldErrors = {};
  for (const issue of parsed.error.issues) {
    const path = issue.path.map(String);
    const key = path[0] === "rates" ? path[1] : path[0];
    errors[fieldOfPath[key] ?? "form"] ??= issue.message;
  }
  return { ok: false, errors };
}
