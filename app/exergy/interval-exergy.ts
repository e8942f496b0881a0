/**
 * Exergy beside energy for heat and cooling meters (design.md, "Fuels,
 * hydrogen and exergy"). Pure.
 *
 * A water_heat reading's exergy at the dead state T₀ (water-exergy.ts) is
 *
 *   Ex = m·(h_flow − h_return) − T₀·m·(s_flow − s_return) = Q − T₀·S
 *
 * so a reading (or the piece of it in one interval) is stored as its heat Q
 * and its entropy flow S, both signed into the site, and its exergy follows
 * for any T₀. The dead state is the day's outdoor mean from the site's
 * weather, which may arrive after the readings: keeping Q and S lets the
 * month be recomputed then, with nothing estimated in between.
 *
 * The rule on T₀ is water-exergy.ts's: a heating flow only while the
 * ambient is below the flow temperature, chilled water only while it is
 * above; otherwise the interval has no exergy ("no data"), never a figure
 * for a mislabelled direction.
 */
import { CELSIUS_OFFSET_K, liquidWater } from "~/physics/water-properties";

const KJ_PER_KWH = 3600;

export interface ExergyBasis {
  /** Q, kWh, signed into the site. */
  heatKwh: number;
  /** S = m·Δs, kWh/K, signed like Q. */
  entropyKwhPerK: number;
  /** The flow temperature T₀ must stay on the useful side of, °C. */
  flowLimitC: number;
  /** Flow warmer than return. */
  heating: boolean;
}

export interface WaterReadingState {
  massKg: number;
  pressureBarAbs: number;
  flowTempC: number;
  returnTempC: number;
  /** +1 or −1: the meter's orientation, as for the reading's energy. */
  siteSign: 1 | -1;
}

/** Q and S of a water_heat reading from IF97 region 1 at its line pressure. */
export function exergyBasis(state: WaterReadingState): ExergyBasis {
  const flow = liquidWater(state.pressureBarAbs, state.flowTempC);
  const ret = liquidWater(state.pressureBarAbs, state.returnTempC);
  const dh = flow.enthalpyKjPerKg - ret.enthalpyKjPerKg;
  const ds = flow.entropyKjPerKgK - ret.entropyKjPerKgK;
  return {
    heatKwh: (state.siteSign * state.massKg * dh) / KJ_PER_KWH,
    entropyKwhPerK: (state.siteSign * state.massKg * ds) / KJ_PER_KWH,
    flowLimitC: state.flowTempC,
    heating: state.flowTempC >= state.returnTempC,
  };
}

/** Whether T₀ lies on the useful side of the flow (water-exergy.ts). */
export function usefulAmbient(
  basis: Pick<ExergyBasis, "flowLimitC" | "heating">,
  ambientC: number,
): boolean {
  return basis.heating
    ? ambientC < basis.flowLimitC
    : ambientC > basis.flowLimitC;
}

/**
 * Exergy into the site, kWh, at the dead state `ambientC`: positive for heat
 * and for chilled water delivered, negative for either exported. Null when
 * the ambient is not on the useful side of the flow.
 */
export function exergyAt(basis: ExergyBasis, ambientC: number): number | null {
  if (!usefulAmbient(basis, ambientC)) return null;
  return basis.heatKwh - (ambientC + CELSIUS_OFFSET_K) * basis.entropyKwhPerK;
}

/** Evaluate details of a water_heat reading, as evaluate.ts returns them. */
interface WaterHeatDetails {
  mass_kg?: unknown;
  pressure_bar_abs?: unknown;
}

/**
 * The basis of an ingested water_heat reading, from its item and its
 * evaluate details; null for any other quantity.
 */
export function readingExergyBasis(
  item: Record<string, unknown>,
  details: WaterHeatDetails,
  siteSign: 1 | -1,
): ExergyBasis | null {
  if (item.quantity !== "water_heat") return null;
  const { mass_kg: massKg, pressure_bar_abs: pressureBarAbs } = details;
  const { flow_temp_c: flowTempC, return_temp_c: returnTempC } = item;
  if (
    typeof massKg !== "number" ||
    typeof pressureBarAbs !== "number" ||
    typeof flowTempC !== "number" ||
    typeof returnTempC !== "number"
  )
    return null;
  return exergyBasis({
    massKg,
    pressureBarAbs,
    flowTempC,
    returnTempC,
    siteSign,
  });
}
