/**
 * The shapes of supplier bills at every boundary: a bill as a file row or
 * API row (text, checked here), a stored bill as the API answers it, a state
 * change and the tolerance. Pure: used by the page, the API and the server.
 */
import { z } from "zod";
import { storableText } from "~/lib/storable-text";

export const billStates = ["agreed", "queried", "resolved"] as const;
export type BillState = (typeof billStates)[number];
export const readTypes = ["actual", "estimated"] as const;
export type ReadType = (typeof readTypes)[number];

/** The file's columns, in the order the template lists them. */
export const billColumns = [
  "supply",
  "period_from",
  "period_to",
  "kwh",
  "amount",
  "read_type",
] as const;

const DAY = /^\d{4}-\d{2}-\d{2}$/;
const DECIMAL = /^-?\d{1,15}(\.\d{1,8})?$/;

function isRealDay(day: string): boolean {
  const date = new Date(`${day}T00:00:00Z`);
  return !Number.isNaN(date.getTime()) && date.toISOString().startsWith(day);
}

const day = (what: string) =>
  z
    .string()
    .regex(DAY, `${what}: a day as YYYY-MM-DD`)
    .refine(isRealDay, `${what}: not a day of the calendar`);
const decimal = (what: string) =>
  z.string().regex(DECIMAL, `${what}: a number such as 1234.56`);

/** One bill as the supplier states it; periods are checked by bill-check.ts. */
export const billRowSchema = z.strictObject({
  supply: storableText(
    z.string().trim().min(1, "supply: a meter code or a tariff's name"),
    "supply",
  ),
  period_from: day("period_from"),
  period_to: day("period_to"),
  kwh: decimal("kwh"),
  amount: decimal("amount"),
  read_type: z.enum(readTypes, {
    error: "read_type: actual or estimated",
  }),
  currency: z
    .string()
    .regex(/^[A-Z]{3}$/, "currency: three capital letters, e.g. GBP")
    .optional(),
});
export type BillRow = z.output<typeof billRowSchema>;

export const MAX_BILLS_PER_UPLOAD = 1000;

export const billUploadSchema = z.strictObject({
  bills: z.array(billRowSchema).min(1).max(MAX_BILLS_PER_UPLOAD),
});

export const billSchema = z.strictObject({
  id: z.string(),
  tariff_id: z.string(),
  supply: z.string(),
  period_from: z.string(),
  period_to: z.string(),
  kwh: z.string(),
  amount: z.string(),
  currency: z.string(),
  read_type: z.enum(readTypes),
  metered_kwh: z.string(),
  computed_cost: z.string(),
  state: z.enum(billStates),
  note: z.string(),
  updated_at: z.string(),
});
export type Bill = z.output<typeof billSchema>;

export const billListSchema = z.strictObject({ bills: z.array(billSchema) });

export const billUploadAnswerSchema = z.strictObject({
  stored: z.number().int(),
  already_stored: z.number().int(),
  agreed: z.number().int(),
  queried: z.number().int(),
});

export const billStateChangeSchema = z.strictObject({
  state: z.enum(billStates, { error: "state: agreed, queried or resolved" }),
  note: storableText(
    z.string().trim().min(1, "Say why (a note)").max(2000),
    "note",
  ),
});

const optionalDecimal = z
  .string()
  .trim()
  .regex(/^(\d{1,12}(\.\d{1,6})?)?$/, "A number of zero or more, e.g. 2.5")
  .transform((s) => (s === "" ? null : s));

export const toleranceSchema = z.strictObject({
  percent: optionalDecimal,
  absolute_kwh: optionalDecimal,
  absolute_amount: optionalDecimal,
});
export type ToleranceInput = z.output<typeof toleranceSchema>;
