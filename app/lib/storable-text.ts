/**
 * Text PostgreSQL can store. Its text and jsonb types refuse the NUL
 * character, and its UTF-8 encoding has no form for a lone UTF-16 surrogate
 * (which JSON's "\uD800" escapes can carry in): such a string fails the whole
 * statement it is in. Every boundary checks strings with this one rule, so a
 * bad character is one field's or one reading's error, never a failed batch
 * or a 500.
 */
import { z } from "zod";

/** A surrogate without its pair: the `u` flag reads a pair as one code point. */
const LONE_SURROGATE = /\p{Cs}/u;

const PROBLEM =
  "contains a NUL character or a lone UTF-16 surrogate, which cannot be stored";

export function isStorableText(value: string): boolean {
  return !value.includes("\u0000") && !LONE_SURROGATE.test(value);
}

/** The sentence for a form field, shown beside it. */
export const UNSTORABLE_FIELD_MESSAGE = `This ${PROBLEM}; remove it.`;

/**
 * The refinement for an API string, worded as the API words errors:
 * `storableText(z.string().trim(), "meter")` refuses with "meter: contains…".
 */
export function storableText<T extends z.ZodString>(
  schema: T,
  field: string,
): T {
  return schema.refine(isStorableText, {
    message: `${field}: ${PROBLEM}`,
    abort: true,
  });
}
