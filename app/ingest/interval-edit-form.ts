/**
 * The form that corrects one interval of a meter: what it posts and what the
 * action answers. Plain module: the route's action parses with it, the
 * Readings page's edit panel reads the answer.
 */
import { z } from "zod";

export const editSchema = z.strictObject({
  intent: z.literal("edit"),
  intervalStart: z.iso.datetime({
    offset: true,
    error: "Choose an interval in the table.",
  }),
  energyKwh: z
    .string()
    .trim()
    .min(1, "Enter the corrected energy.")
    .max(24)
    .transform((v, ctx) => {
      const n = Number(v);
      if (!Number.isFinite(n) || Math.abs(n) > 1e9) {
        ctx.addIssue({
          code: "custom",
          message:
            "Enter a number of kWh (negative for energy leaving the site).",
        });
        return z.NEVER;
      }
      return n;
    }),
  reason: z
    .string()
    .trim()
    .min(5, "Say why, in at least 5 characters: it goes to the audit log.")
    .max(500, "Use at most 500 characters."),
  /**
   * The value the person confirmed after being shown how far it lies from
   * the meter's history: a confirmation of another value does not count.
   */
  confirmSpike: z.string().trim().max(24).optional(),
});

export type EditAnswer = {
  errors: Record<string, string>;
  saved: { intervalStart: string; flags: string[] } | null;
  /** The value to confirm, when it lies far outside the meter's history. */
  confirm: { intervalStart: string; energyKwh: string } | null;
};
