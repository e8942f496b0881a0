import { z } from "zod";
import { optionalNumberField as decimal } from "~/lib/forms";
import { optionalIdField } from "~/lib/ids";
import {
  carrierInText,
  carriers,
  carriersFor,
  isFuelCarrier,
  meterPositions,
  DEFAULT_INTERVAL_MINUTES,
  intervalResolutions,
  orientations,
  quantities,
  sensorPositions,
  type IntervalMinutes,
} from "./meter-kinds";

const dateField = (label: string) =>
  z
    .string()
    .trim()
    .max(40)
    .transform((v, ctx) => {
      if (v === "") return null;
      const d = new Date(v.length === 10 ? `${v}T00:00:00Z` : v);
      if (
        Number.isNaN(d.getTime()) ||
        d.getUTCFullYear() < 1990 ||
        d.getUTCFullYear() > 2100
      ) {
        ctx.addIssue({
          code: "custom",
          message: `${label} must be a date (YYYY-MM-DD) from 1990 on.`,
        });
        return z.NEVER;
      }
      return d;
    });

export const meterCodeField = z
  .string()
  .trim()
  .min(1, "Enter the code gateways use for this meter.")
  .max(64, "Use at most 64 characters.")
  .regex(
    /^[A-Za-z0-9][A-Za-z0-9._\-/]*$/,
    "Use letters, digits and . _ - / only, starting with a letter or digit.",
  );

export const meterFormSchema = z
  .strictObject({
    intent: z.literal("save-meter"),
    code: meterCodeField,
    name: z
      .string()
      .trim()
      .min(1, "Enter a name.")
      .max(120, "Use at most 120 characters."),
    quantity: z.enum(quantities, { error: "Choose what the meter measures." }),
    carrier: z.enum(carriers, { error: "Choose the energy carrier." }),
    orientation: z.enum(orientations, {
      error: "Choose import or export.",
    }),
    parentMeterId: optionalIdField("Choose a parent meter from the list."),
    position: z.enum(meterPositions, {
      error: "Choose on the boundary or inside it.",
    }),
    // Left out or empty (an API body without it): the default, hourly.
    intervalMinutes: z
      .enum(["", ...(intervalResolutions.map(String) as ["15", "30", "60"])], {
        error: "Choose 15, 30 or 60 minutes per interval.",
      })
      .default("")
      .transform(
        (v) => Number(v || DEFAULT_INTERVAL_MINUTES) as IntervalMinutes,
      ),
    serial: z.string().trim().max(64, "Use at most 64 characters."),
    multiplier: decimal("Multiplier", 0.0001, 100_000).transform((v) => v ?? 1),
    rolloverKwh: decimal("Roll-over point", 1, 1e12),
    sensorAt: z.enum(["", ...sensorPositions]),
    defaultPressureBarAbs: decimal("Default pressure", 0.006, 40),
    spikeFactor: decimal("Spike factor", 1.5, 1000).transform((v) => v ?? 10),
    accuracyClass: z.enum(["", "1", "2", "3"], {
      error: "Choose class 1, 2 or 3, or none.",
    }),
    deltaThetaMinK: decimal("Δθmin", 0.1, 50),
    qpM3PerH: decimal("qp", 0.001, 100_000),
    installedAt: dateField("Installed on").refine(
      (d) => d !== null,
      "Enter the installation date.",
    ),
  })
  .superRefine((v, ctx) => {
    if (!carriersFor[v.quantity].includes(v.carrier)) {
      ctx.addIssue({
        code: "custom",
        path: ["carrier"],
        message: `A ${v.quantity.replace("_", " ")} meter accounts for ${carriersFor[v.quantity].map(carrierInText).join(" or ")}.`,
      });
    }
    if (isFuelCarrier(v.carrier) && v.orientation !== "import") {
      ctx.addIssue({
        code: "custom",
        path: ["orientation"],
        message:
          "A fuel meter imports: a site buys fuel, it does not export it.",
      });
    }
    const rating = [
      v.accuracyClass !== "",
      v.deltaThetaMinK !== null,
      v.qpM3PerH !== null,
    ];
    if (rating.some(Boolean) && !rating.every(Boolean)) {
      ctx.addIssue({
        code: "custom",
        path: ["accuracyClass"],
        message: "The EN 1434 band needs the class, Δθmin and qp together.",
      });
    }
    if (v.quantity === "water_heat" && v.sensorAt === "") {
      ctx.addIssue({
        code: "custom",
        path: ["sensorAt"],
        message: "Say which pipe the flow sensor sits in.",
      });
    }
  });

export type MeterInput = Omit<z.infer<typeof meterFormSchema>, "intent">;

/** Why a meter was retired or swapped: optional, kept in the audit trail. */
const changeReason = z
  .string()
  .trim()
  .max(500, "Use at most 500 characters.")
  .default("");

export const retireSchema = z.strictObject({
  intent: z.literal("retire"),
  reason: changeReason,
  removedAt: dateField("Removed on").refine(
    (d) => d !== null,
    "Enter the removal date.",
  ),
});

export const replaceSchema = z.strictObject({
  intent: z.literal("replace"),
  reason: changeReason,
  code: meterCodeField,
  serial: z.string().trim().max(64),
  swappedAt: dateField("Swapped on").refine(
    (d) => d !== null,
    "Enter when the meters were swapped.",
  ),
});
