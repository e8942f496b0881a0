import { z } from "zod";

/** IANA time zones this runtime knows; a site's local time drives profiles. */
export function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

const optionalNumber = (label: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .max(20)
    .transform((v, ctx) => {
      if (v === "") return undefined;
      const n = Number(v);
      if (!Number.isFinite(n)) {
        ctx.addIssue({ code: "custom", message: `${label} must be a number.` });
        return z.NEVER;
      }
      if (n < min || n > max) {
        ctx.addIssue({
          code: "custom",
          message: `${label} must be between ${min} and ${max}.`,
        });
        return z.NEVER;
      }
      return n;
    });

export const siteFormSchema = z.strictObject({
  intent: z.literal("save-site"),
  name: z
    .string()
    .trim()
    .min(1, "Enter the site's name.")
    .max(120, "Use at most 120 characters."),
  timeZone: z
    .string()
    .trim()
    .min(1, "Choose the site's time zone.")
    .max(64)
    .refine(
      isTimeZone,
      "Not a time zone this server knows, e.g. Europe/London.",
    ),
  floorAreaM2: optionalNumber("Floor area", 0.01, 10_000_000),
  degreeDayBaseC: optionalNumber(
    "Degree day base temperature",
    -10,
    30,
  ).transform((v) => v ?? 15.5),
  address: z.string().trim().max(300, "Use at most 300 characters."),
});

export type SiteInput = Omit<z.infer<typeof siteFormSchema>, "intent">;
