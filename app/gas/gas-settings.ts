/**
 * A natural-gas meter's register and volume-correction settings, as the API
 * and the meter page's form give them. The ranges are the physics module's
 * (gas-volume.ts), so a setting can never produce a volume a reading could
 * not state.
 */
import { z } from "zod";
import { CORRECTION_FACTOR_RANGE, GAS_RANGES } from "../physics/gas-volume";
import { gasRegisterUnits } from "./calorific-values";

const inRange = (
  field: string,
  range: { min: number; max: number },
  unit: string,
) =>
  z
    .number({ error: `${field}: expected a number` })
    .min(range.min, `${field}: must be ${range.min} to ${range.max}${unit}`)
    .max(range.max, `${field}: must be ${range.min} to ${range.max}${unit}`)
    .nullable()
    .default(null);

const factorRange = {
  min: Number(CORRECTION_FACTOR_RANGE.min.toFixed(4)),
  max: Number(CORRECTION_FACTOR_RANGE.max.toFixed(4)),
};

export const gasSettingsInputSchema = z
  .strictObject({
    register_unit: z
      .enum(gasRegisterUnits, { error: "register_unit: expected m3 or hcf" })
      .nullable()
      .default(null)
      .describe(
        "m3 or hcf: the meter reads a cumulative register in this unit (with its multiplier and roll-over point); null: it sends interval volumes",
      ),
    correction_factor: inRange("correction_factor", factorRange, ""),
    gas_temp_c: inRange("gas_temp_c", GAS_RANGES.gasTempC, " °C"),
    gas_pressure_mbar_g: inRange(
      "gas_pressure_mbar_g",
      GAS_RANGES.gasPressureMbarG,
      " mbar g",
    ),
    atmospheric_pressure_mbar: inRange(
      "atmospheric_pressure_mbar",
      GAS_RANGES.atmosphericPressureMbar,
      " mbar",
    ),
  })
  .superRefine((s, ctx) => {
    const line = s.gas_temp_c !== null || s.gas_pressure_mbar_g !== null;
    if (s.correction_factor !== null && line)
      ctx.addIssue({
        code: "custom",
        path: ["correction_factor"],
        message:
          "correction_factor: give a correction factor or the gas temperature and pressure, not both",
      });
    if (line && (s.gas_temp_c === null || s.gas_pressure_mbar_g === null))
      ctx.addIssue({
        code: "custom",
        path: [s.gas_temp_c === null ? "gas_temp_c" : "gas_pressure_mbar_g"],
        message: `${s.gas_temp_c === null ? "gas_temp_c" : "gas_pressure_mbar_g"}: the gas temperature and gauge pressure go together`,
      });
    if (s.atmospheric_pressure_mbar !== null && !line)
      ctx.addIssue({
        code: "custom",
        path: ["atmospheric_pressure_mbar"],
        message:
          "atmospheric_pressure_mbar: only with the gas temperature and pressure",
      });
  });
export type GasSettingsInput = z.output<typeof gasSettingsInputSchema>;
