import { z } from "zod";
import { isStorableText, UNSTORABLE_FIELD_MESSAGE } from "./storable-text";

export type FieldErrors = Record<string, string>;

export type FormResult<T> =
  { ok: true; data: T } | { ok: false; errors: FieldErrors };

/**
 * Parses a submitted form with a strict zod schema: fields the form does not
 * have are refused, and each problem is returned under its field's name so
 * the page can show it beside the field.
 */
export function parseForm<T>(
  formData: FormData,
  schema: z.ZodType<T>,
): FormResult<T> {
  const values: Record<string, unknown> = {};
  for (const [key, value] of formData.entries()) {
    if (typeof value !== "string") {
      return { ok: false, errors: { form: `“${key}” must be text.` } };
    }
    if (key in values) {
      return { ok: false, errors: { form: `“${key}” was sent twice.` } };
    }
    values[key] = value;
  }
  const unstorable = unstorableFields(values);
  if (unstorable) return { ok: false, errors: unstorable };
  const parsed = schema.safeParse(values);
  if (parsed.success) return { ok: true, data: parsed.data };
  const errors: FieldErrors = {};
  for (const issue of parsed.error.issues) {
    const key =
      issue.code === "unrecognized_keys"
        ? "form"
        : String(issue.path[0] ?? "form");
    errors[key] ??= issue.message;
  }
  return { ok: false, errors };
}

/**
 * Every field of every form passes the one rule for text PostgreSQL can
 * store (names, reasons, codes alike), before its schema is asked.
 */
function unstorableFields(values: Record<string, unknown>): FieldErrors | null {
  const errors: FieldErrors = {};
  for (const [key, value] of Object.entries(values)) {
    if (typeof value === "string" && !isStorableText(value))
      errors[key] = UNSTORABLE_FIELD_MESSAGE;
  }
  return Object.keys(errors).length > 0 ? errors : null;
}

export const emailField = z
  .string({ error: "Enter an e-mail address." })
  .trim()
  .min(1, "Enter an e-mail address.")
  .max(254, "An e-mail address has at most 254 characters.")
  .pipe(z.email("Enter a valid e-mail address, like name@example.org."));

export const newPasswordField = z
  .string({ error: "Enter a password." })
  .min(10, "Use at least 10 characters.")
  .max(200, "Use at most 200 characters.");

export const nameField = z
  .string({ error: "Enter a name." })
  .trim()
  .min(1, "Enter a name.")
  .max(120, "Use at most 120 characters.");

/**
 * An optional number typed into a form: empty is null, anything else must be
 * a finite number within [min, max], or the field gets a sentence naming the
 * range.
 */
export const optionalNumberField = (label: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .max(24)
    .transform((v, ctx) => {
      if (v === "") return null;
      const n = Number(v);
      if (!Number.isFinite(n) || n < min || n > max) {
        ctx.addIssue({
          code: "custom",
          message: `${label} must be a number from ${min} to ${max}.`,
        });
        return z.NEVER;
      }
      return n;
    });
