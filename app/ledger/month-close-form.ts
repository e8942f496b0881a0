/**
 * The Ledger page's month-close forms: what they post and what the action
 * answers. Plain module: the route's action parses with it, the form reads
 * the answer's type.
 */
import { z } from "zod";
import { monthLong } from "~/lib/format";
import { optionalIdField } from "~/lib/ids";
import { MONTH_PATTERN } from "~/lib/months";

const monthField = z
  .string()
  .trim()
  .regex(MONTH_PATTERN, "Choose a month, like 2025-01.");
const siteField = optionalIdField(
  "Choose a site from the list, or the whole organisation.",
);

export const closeSchema = z.strictObject({
  intent: z.literal("close", { error: "Unknown action." }),
  month: monthField,
  siteId: siteField,
});

export const reopenSchema = z.strictObject({
  intent: z.literal("reopen"),
  month: monthField,
  siteId: siteField,
  reason: z
    .string()
    .trim()
    .min(5, "Say why, in at least 5 characters: it goes to the audit log.")
    .max(500, "Use at most 500 characters."),
});

/** The action's answer, for the form that posted (`intent`). */
export type MonthCloseResult = {
  intent: string;
  errors: Record<string, string>;
  message?: string;
};

/** The success message; `where` is a site's name or "the whole organisation". */
export function monthCloseMessage(
  reopening: boolean,
  month: string,
  where: string,
): string {
  return reopening
    ? `${monthLong(month)} is open again for ${where}; the reason is in the audit log.`
    : `${monthLong(month)} is closed for ${where}. Later corrections appear as adjustments.`;
}
