/**
 * The gas readings' part of preparing a batch (ingest's prepare-readings):
 * a gas_volume reading without its own CV takes each interval's CV from the
 * supply's series, or is refused when a day has none; a gas register read
 * is checked against the meter's register unit and roll-over point. Pure.
 */
import { evaluateItem } from "../physics/evaluate";
import { GAS_RANGES } from "../physics/gas-volume";
import {
  daysWithoutCv,
  priceByDay,
  volumePieces,
  type GasMeterContext,
  type GasPiece,
  type GasSettings,
} from "./gas-intervals";

export type SeriesGasOutcome =
  | { ok: true; energyKwh: number; pieces: GasPiece[] }
  | { ok: false; reason: string };

/** Whether a gas item leaves its CV to the supply's series. */
export function takesSeriesCv(item: Record<string, unknown>): boolean {
  return (
    item.quantity === "gas_volume" && item.calorific_value_mj_m3 === undefined
  );
}

/**
 * The meter's volume correction fills a gas item that states none (a
 * reading's own factor or line conditions always win).
 */
export function withGasDefaults(
  item: Record<string, unknown>,
  settings: GasSettings,
): Record<string, unknown> {
  const states =
    item.correction_factor !== undefined ||
    item.gas_temp_c !== undefined ||
    item.gas_pressure_mbar_g !== undefined;
  if (item.quantity !== "gas_volume" || states) return item;
  if (settings.correctionFactor !== null)
    item.correction_factor = settings.correctionFactor;
  else if (settings.gasTempC !== null && settings.gasPressureMbarG !== null) {
    item.gas_temp_c = settings.gasTempC;
    item.gas_pressure_mbar_g = settings.gasPressureMbarG;
    if (settings.atmosphericPressureMbar !== null)
      item.atmospheric_pressure_mbar = settings.atmosphericPressureMbar;
  }
  return item;
}

// Any CV inside the accepted range: the item is evaluated only for its
// checked volume at reference conditions; the CVs come from the series.
const PLACEHOLDER_CV = GAS_RANGES.calorificValueMjM3.min;

/**
 * A gas_volume reading priced by the series: its volume at reference
 * conditions split over the meter's intervals, each at its day's CV. A day
 * without a CV refuses the whole reading, naming the days, so nothing of it
 * is stored at a made-up CV.
 */
export function priceSeriesGasReading(args: {
  item: Record<string, unknown>;
  meterCode: string;
  start: Date;
  end: Date;
  stepMs: number;
  context: GasMeterContext;
}): SeriesGasOutcome {
  const { item, meterCode, context } = args;
  const checked = evaluateItem({
    ...item,
    calorific_value_mj_m3: PLACEHOLDER_CV,
  });
  if (!checked.ok) return { ok: false, reason: checked.error };
  const volume = Number(checked.details.volume_at_reference_m3);
  const pieces = priceByDay(
    volumePieces(args.start, args.end, volume, args.stepMs),
    context,
  );
  const missing = daysWithoutCv(pieces, context.timeZone);
  if (missing.length) {
    return {
      ok: false,
      reason:
        `calorific_value_mj_m3: not given, and meter ${meterCode}'s supply has no ` +
        `calorific value for ${missing.join(", ")} (site-local day); enter it on the ` +
        "meter's page or send calorific_value_mj_m3 with the reading",
    };
  }
  const energyKwh = pieces.reduce((sum, p) => sum + p.energyKwh, 0);
  return { ok: true, energyKwh, pieces };
}

/**
 * Null when a gas register read fits its meter: set up as a register, in
 * the unit it reads in, below its roll-over point, with a CV for its day.
 */
export function gasRegisterError(args: {
  meterCode: string;
  meterQuantity: string;
  context: GasMeterContext | undefined;
  unit: "m3" | "hcf";
  register: number;
  time: Date;
  rollover: number | null;
  dayHasCv: boolean;
}): string | null {
  const { meterCode, context, unit } = args;
  if (!context || args.meterQuantity !== "gas_volume")
    return `quantity: meter ${meterCode} measures ${args.meterQuantity}; gas_register reads are for natural-gas meters`;
  const own = context.settings.registerUnit;
  if (own === null)
    return `quantity: meter ${meterCode} has no gas register set up; send gas_volume readings, or set its register unit on the meter's page`;
  if (own !== unit)
    return `register_${unit}: meter ${meterCode}'s register reads in ${own === "m3" ? "m³" : "hcf"}; send register_${own}`;
  if (args.rollover !== null && args.register >= args.rollover)
    return `register_${unit}: ${args.register} is not below the register's roll-over point ${args.rollover}`;
  if (!args.dayHasCv)
    return `time: meter ${meterCode}'s supply has no calorific value for the day of this read; enter it on the meter's page first`;
  return null;
}
