/**
 * One interval of a meter, at the meter's own resolution, as the API answers
 * it (`GET …/meters/:meterId/intervals`) and the readings page shows it; the
 * domain's reads return it.
 */
import { z } from "zod";
import { decimalKwh } from "~/lib/wire-schemas";
import { intervalQualities } from "./series";

export const intervalSchema = z.strictObject({
  start: z.iso.datetime().describe("Start of the interval (UTC)"),
  end: z.iso
    .datetime()
    .describe("End of the interval: start + the meter's interval_minutes"),
  energy_kwh: decimalKwh("Signed energy of the interval (into the site +)"),
  quality: z.enum(intervalQualities),
  flags: z.array(z.string()),
  estimate_method: z.string().nullable(),
  source_count: z.number().int().describe("Readings behind the interval"),
});
export type Interval = z.output<typeof intervalSchema>;
