/**
 * One hour of a meter as the API answers it (`GET …/meters/:meterId/
 * intervals`) and the readings page shows it; the domain's reads return it.
 */
import { z } from "zod";
import { decimalKwh } from "~/lib/wire-schemas";
import { intervalQualities } from "./series";

export const intervalSchema = z.strictObject({
  hour_start: z.iso.datetime(),
  energy_kwh: decimalKwh("Signed energy of the hour (into the site +)"),
  quality: z.enum(intervalQualities),
  flags: z.array(z.string()),
  estimate_method: z.string().nullable(),
  source_count: z.number().int().describe("Readings behind the hour"),
});
export type Interval = z.output<typeof intervalSchema>;
