/**
 * The plant form: a kind, a name, the meter on each of its inputs and
 * outputs, and its design water temperatures where the laws need them.
 */
import { z } from "zod";
import { optionalNumberField } from "~/lib/forms";
import { optionalIdField } from "~/lib/ids";
import {
  needsChilledTemperatures,
  needsHeatTemperatures,
  plantKinds,
  plantMeterRoleLabels,
  plantMeterRoles,
  rolesOf,
  type PlantMeterRole,
} from "./plant-roles";

/** A temperature in °C, empty for none. */
const temperature = (label: string, min: number, max: number) =>
  optionalNumberField(`${label} (°C)`, min, max);

/** The form field that names the meter in a role, e.g. `meter_heat_out`. */
export const roleField = (role: PlantMeterRole) => `meter_${role}` as const;

const meterField = optionalIdField("Choose a meter from the list.").default("");
const meterFields = Object.fromEntries(
  plantMeterRoles.map((role) => [roleField(role), meterField]),
) as Record<`meter_${PlantMeterRole}`, typeof meterField>;

export const plantFormSchema = z
  .strictObject({
    intent: z.literal("add-plant"),
    name: z
      .string()
      .trim()
      .min(1, "Name the plant, e.g. “Boiler house 1”.")
      .max(80, "Use at most 80 characters."),
    kind: z.enum(plantKinds, "Choose what kind of plant this is."),
    fuelCvBasis: z.enum(["gross", "net"]).default("gross"),
    heatFlowC: temperature("Heating flow", 20, 130).default(null),
    heatReturnC: temperature("Heating return", 10, 120).default(null),
    chilledFlowC: temperature("Chilled-water flow", 0, 25).default(null),
    chilledReturnC: temperature("Chilled-water return", 0, 30).default(null),
    ...meterFields,
  })
  .superRefine((form, ctx) => {
    for (const role of rolesOf[form.kind]) {
      if (!form[roleField(role)])
        ctx.addIssue({
          code: "custom",
          path: [roleField(role)],
          message: `Choose the meter that measures ${plantMeterRoleLabels[role].toLowerCase()}.`,
        });
    }
    if (needsHeatTemperatures(form.kind)) {
      if (form.heatFlowC === null || form.heatReturnC === null)
        ctx.addIssue({
          code: "custom",
          path: ["heatFlowC"],
          message:
            "Enter the design flow and return temperatures of the heating water.",
        });
      else if (form.heatFlowC <= form.heatReturnC)
        ctx.addIssue({
          code: "custom",
          path: ["heatReturnC"],
          message: "The heating return must be cooler than the flow.",
        });
    }
    if (needsChilledTemperatures(form.kind)) {
      if (form.chilledFlowC === null || form.chilledReturnC === null)
        ctx.addIssue({
          code: "custom",
          path: ["chilledFlowC"],
          message:
            "Enter the design flow and return temperatures of the chilled water.",
        });
      else if (form.chilledFlowC >= form.chilledReturnC)
        ctx.addIssue({
          code: "custom",
          path: ["chilledReturnC"],
          message: "The chilled-water return must be warmer than the flow.",
        });
    }
  });
export type PlantForm = z.output<typeof plantFormSchema>;

/** The meters the form names for the roles its kind has (others are ignored). */
export function roleMeters(
  form: PlantForm,
): { role: PlantMeterRole; meterId: string }[] {
  return rolesOf[form.kind].flatMap((role) => {
    const meterId = form[roleField(role)];
    return meterId ? [{ role, meterId }] : [];
  });
}
