/**
 * The envelope of one gateway reading (design.md, "Gateway API"): which
 * meter, which quantity and when. The measured fields themselves are checked
 * by the physics item schemas when the energy is computed.
 */
import { z } from "zod";
import { isStorableText, storableText } from "../lib/storable-text";
import {
  QUANTITIES,
  electricWorkItemSchema,
  gasVolumeItemSchema,
  hydrogenItemSchema,
  liquidFuelItemSchema,
  sensibleHeatItemSchema,
  solidFuelItemSchema,
  steamHeatItemSchema,
  waterHeatItemSchema,
} from "../physics/evaluate-schema";
import { instantError, intervalError } from "./time-rules";

export const MAX_READINGS_PER_BATCH = 5000;

export const REGISTER_QUANTITIES = [
  "electric_register",
  "heat_register",
] as const;
export type RegisterQuantity = (typeof REGISTER_QUANTITIES)[number];

export function isRegisterQuantity(q: string): q is RegisterQuantity {
  return (REGISTER_QUANTITIES as readonly string[]).includes(q);
}

// The code is looked up and stored: a NUL in it would fail the whole batch's
// statements, so it is refused here, for this reading alone.
const meterCode = storableText(
  z
    .string({ error: "meter: expected the meter's code as a string" })
    .trim()
    .min(1, "meter: must not be empty")
    .max(64, "meter: at most 64 characters"),
  "meter",
);

const instant = (field: string) =>
  z.iso
    .datetime({
      offset: true,
      error: `${field}: expected an ISO 8601 date-time with offset`,
    })
    .transform((s) => new Date(s));

/**
 * What a reading may carry: every quantity a meter measures, and the kWh of
 * an interval, which any interval meter accepts (interval-energy.ts).
 */
export const READING_QUANTITIES = [
  ...QUANTITIES,
  "interval_energy",
  "gas_register",
] as const;

const envelopeSchema = z.looseObject({
  meter: meterCode,
  quantity: z.enum(READING_QUANTITIES, {
    error: `quantity: expected one of ${READING_QUANTITIES.join(", ")}`,
  }),
});

const intervalTimes = z.looseObject({
  start: instant("start"),
  end: instant("end"),
});

/** What `instant` accepts: zod's own pattern for an ISO date-time with offset. */
const ISO_INSTANT = z.regexes.datetime({ offset: true });

const registerSchema = z.strictObject({
  meter: meterCode,
  quantity: z.enum(REGISTER_QUANTITIES),
  time: instant("time"),
  register_kwh: z
    .number({ error: "register_kwh: expected a finite number" })
    .min(0, "register_kwh: must not be negative"),
});

/**
 * The kWh of one of the meter's intervals, as a supplier's file gives it: a
 * magnitude, signed by the meter's orientation when it is stored.
 */
const intervalEnergySchema = z.strictObject({
  meter: meterCode,
  quantity: z.literal("interval_energy"),
  start: instant("start"),
  end: instant("end"),
  energy_kwh: z
    .number({ error: "energy_kwh: expected a finite number of kWh" })
    .min(
      0,
      "energy_kwh: must not be negative; the sign comes from the meter's orientation (import or export)",
    )
    .describe(
      "Energy in the interval, kWh, ≥ 0; an export meter's is stored negative",
    ),
});

/**
 * A gas register read (app/gas/): the register of a natural-gas meter set up
 * with a register unit, in that unit: cubic metres or hundreds of cubic feet.
 */
const gasRegisterSchema = z
  .strictObject({
    meter: meterCode,
    quantity: z.literal("gas_register"),
    time: instant("time"),
    register_m3: z
      .number({ error: "register_m3: expected a finite number" })
      .min(0, "register_m3: must not be negative")
      .optional()
      .describe("The register in cubic metres, on an m³ register"),
    register_hcf: z
      .number({ error: "register_hcf: expected a finite number" })
      .min(0, "register_hcf: must not be negative")
      .optional()
      .describe(
        "The register in hundreds of cubic feet (1 hcf = 2.8316846592 m³), on an hcf register",
      ),
  })
  .refine(
    (r) => (r.register_m3 === undefined) !== (r.register_hcf === undefined),
    {
      error: "register_m3: give exactly one of register_m3 and register_hcf",
    },
  );

/** An interval reading: an evaluate item plus its meter and its hour span. */
const intervalReadingFields = {
  meter: meterCode,
  start: instant("start"),
  end: instant("end"),
};

/**
 * A well-formed reading, as the API document shows it. A batch is not parsed
 * with it: each reading is checked on its own (parseReading), so one bad
 * reading is rejected in its place and the rest of the batch is stored.
 * The `id` names its component in the API document; it is given here rather
 * than in the document's list because the times turn into Dates, which only
 * a request (never an answer) can describe.
 */
export const wellFormedReadingSchema = z
  .discriminatedUnion("quantity", [
    waterHeatItemSchema.extend(intervalReadingFields),
    steamHeatItemSchema.extend(intervalReadingFields),
    sensibleHeatItemSchema.extend(intervalReadingFields),
    electricWorkItemSchema.extend(intervalReadingFields),
    // Fuels: a gas meter's volume, an oil tank's litres or stock, hydrogen.
    gasVolumeItemSchema.extend({
      ...intervalReadingFields,
      // Left out, the CV in effect on the interval's site-local day is
      // taken from the supply's series (app/gas/calorific-values.ts).
      calorific_value_mj_m3:
        gasVolumeItemSchema.shape.calorific_value_mj_m3.optional(),
    }),
    liquidFuelItemSchema.extend(intervalReadingFields),
    hydrogenItemSchema.extend(intervalReadingFields),
    // Biomass by weight: a boiler's fuel store weighed out, or a delivery.
    solidFuelItemSchema.extend(intervalReadingFields),
    intervalEnergySchema,
    registerSchema,
    gasRegisterSchema,
  ])
  .meta({ id: "Reading" });

/** A batch of well-formed readings: the body the API document shows. */
export const wellFormedReadingBatchSchema = z
  .strictObject({
    readings: z
      .array(wellFormedReadingSchema)
      .min(1)
      .max(MAX_READINGS_PER_BATCH),
  })
  .meta({ id: "ReadingBatch" });

export type ParsedReading =
  | {
      kind: "interval";
      meter: string;
      quantity: string;
      start: Date;
      end: Date;
      /** The reading without `meter`: a physics evaluate item. */
      item: Record<string, unknown>;
    }
  | {
      kind: "interval_energy";
      meter: string;
      quantity: "interval_energy";
      start: Date;
      end: Date;
      /** The interval's kWh as sent: a magnitude, never negative. */
      energyKwh: number;
    }
  | {
      kind: "register";
      meter: string;
      quantity: RegisterQuantity;
      time: Date;
      registerKwh: number;
    }
  | {
      kind: "gas_register";
      meter: string;
      quantity: "gas_register";
      time: Date;
      /** The register in the unit named by `unit`. */
      register: number;
      unit: "m3" | "hcf";
    };

function firstIssue(error: z.ZodError): string {
  const issue = error.issues[0];
  const path = issue.path.map(String).join(".");
  return issue.message.includes(":") || !path
    ? issue.message
    : `${path}: ${issue.message}`;
}

interface IntervalEnvelope {
  meter: string;
  quantity: string;
  start: Date;
  end: Date;
}

/**
 * The usual interval reading, checked field by field by the same rules as
 * the object schemas below (whose cost, copying each reading, shows at
 * thousands per batch). Anything unusual gives null and takes the schemas'
 * path, which words the error.
 */
function quickEnvelope(raw: Record<string, unknown>): IntervalEnvelope | null {
  const { meter, quantity } = raw;
  if (typeof meter !== "string" || typeof quantity !== "string") return null;
  const code = meter.trim();
  if (code.length < 1 || code.length > 64 || !isStorableText(code)) return null;
  const known = (QUANTITIES as readonly string[]).includes(quantity);
  if (!known || isRegisterQuantity(quantity)) return null;
  const { start, end } = raw;
  if (typeof start !== "string" || !ISO_INSTANT.test(start)) return null;
  if (typeof end !== "string" || !ISO_INSTANT.test(end)) return null;
  return { meter: code, quantity, start: new Date(start), end: new Date(end) };
}

function intervalReading(
  raw: Record<string, unknown>,
  envelope: IntervalEnvelope,
  now: Date,
): { ok: true; reading: ParsedReading } | { ok: false; error: string } {
  const { meter, quantity, start, end } = envelope;
  const error = intervalError(start, end, now);
  if (error) return { ok: false, error };
  const { meter: _meter, ...item } = raw;
  return {
    ok: true,
    reading: { kind: "interval", meter, quantity, start, end, item },
  };
}

/** Parses one reading's envelope; the error is a plain sentence with the field. */
export function parseReading(
  raw: unknown,
  now = new Date(),
): { ok: true; reading: ParsedReading } | { ok: false; error: string } {
  if (typeof raw !== "object" || raw === null || Array.isArray(raw)) {
    return { ok: false, error: "expected a JSON object" };
  }
  const record = raw as Record<string, unknown>;
  const quick = quickEnvelope(record);
  if (quick) return intervalReading(record, quick, now);
  return parseWithSchemas(record, now);
}

/**
 * The schemas' path, which words every error. It is also the reference the
 * quick path must agree with (reading-schema.test.ts).
 */
export function parseWithSchemas(
  raw: Record<string, unknown>,
  now = new Date(),
): { ok: true; reading: ParsedReading } | { ok: false; error: string } {
  const envelope = envelopeSchema.safeParse(raw);
  if (!envelope.success)
    return { ok: false, error: firstIssue(envelope.error) };
  if (isRegisterQuantity(envelope.data.quantity))
    return parseRegister(raw, now);
  if (envelope.data.quantity === "interval_energy")
    return parseIntervalEnergy(raw, now);
  if (envelope.data.quantity === "gas_register")
    return parseGasRegister(raw, now);
  const times = intervalTimes.safeParse(raw);
  if (!times.success) return { ok: false, error: firstIssue(times.error) };
  const { meter, quantity } = envelope.data;
  const { start, end } = times.data;
  return intervalReading(raw, { meter, quantity, start, end }, now);
}

function parseIntervalEnergy(raw: object, now: Date) {
  const parsed = intervalEnergySchema.safeParse(raw);
  if (!parsed.success)
    return { ok: false as const, error: firstIssue(parsed.error) };
  const { meter, start, end, energy_kwh } = parsed.data;
  const error = intervalError(start, end, now);
  if (error) return { ok: false as const, error };
  return {
    ok: true as const,
    reading: {
      kind: "interval_energy" as const,
      meter,
      quantity: "interval_energy" as const,
      start,
      end,
      energyKwh: energy_kwh,
    },
  };
}

function parseRegister(raw: object, now: Date) {
  const parsed = registerSchema.safeParse(raw);
  if (!parsed.success)
    return { ok: false as const, error: firstIssue(parsed.error) };
  const timeError = instantError("time", parsed.data.time, now);
  if (timeError) return { ok: false as const, error: timeError };
  return {
    ok: true as const,
    reading: {
      kind: "register" as const,
      meter: parsed.data.meter,
      quantity: parsed.data.quantity,
      time: parsed.data.time,
      registerKwh: parsed.data.register_kwh,
    },
  };
}

function parseGasRegister(raw: object, now: Date) {
  const parsed = gasRegisterSchema.safeParse(raw);
  if (!parsed.success)
    return { ok: false as const, error: firstIssue(parsed.error) };
  const timeError = instantError("time", parsed.data.time, now);
  if (timeError) return { ok: false as const, error: timeError };
  const { meter, time, register_m3, register_hcf } = parsed.data;
  return {
    ok: true as const,
    reading: {
      kind: "gas_register" as const,
      meter,
      quantity: "gas_register" as const,
      time,
      register: register_m3 ?? register_hcf!,
      unit: register_m3 === undefined ? ("hcf" as const) : ("m3" as const),
    },
  };
}
