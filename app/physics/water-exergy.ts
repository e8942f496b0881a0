// Exergy carried into the site by a water circuit (design.md, "Fuels,
// hydrogen and exergy"; references.md §9):
//
//   Ex = m · [(h_flow − h_return) − T₀ · (s_flow − s_return)]
//
// with h and s from IF97 region 1 at the line pressure and T₀ the dead-state
// (ambient) temperature in K. The dead state's own h₀ and s₀ cancel in the
// difference, so no property is needed at T₀ and an ambient below 0 °C is
// fine.
//
// Why the sign comes out positive for heating AND chilled water: along the
// isobar from return to flow, dh = T·ds, so
//   Ex/m = ∫ (1 − T₀/T) dh   (from the return state to the flow state).
// - Heating, T₀ below the water: dh > 0 and (1 − T₀/T) > 0, so Ex > 0.
// - Chilled water, T₀ above the water: dh < 0 (the flow is colder) and
//   (1 − T₀/T) < 0, so Ex > 0 again, although the heat Q = m·Δh is negative.
// Water colder than the surroundings is a resource just as hot water is:
// the site receives the ability to absorb heat below ambient, which would
// otherwise take work. So Q keeps the heat's sign (negative for cooling) and
// Ex is positive when exergy enters the site in either case.
//
// The rule on T₀ (refused otherwise): the flow must be on the useful side of
// the ambient, T₀ < t_flow for a heating flow (flow warmer than return) and
// T₀ > t_flow for a chilled flow (flow colder than return). An ambient at or
// beyond the flow temperature makes the "heating" water no warmer than the
// surroundings (or the "chilled" water no colder), so the integrand is
// nowhere positive and the figure is not exergy delivered but a mislabelled
// direction or a wrong ambient. With T₀ between the return and the flow the
// figure is kept: it is smaller, because part of the way the water is on the
// other side of the ambient, and it is what the second law gives.

import {
  PhysicsRangeError,
  requireInRange,
  requireNonNegative,
} from "./errors";
import { CELSIUS_OFFSET_K } from "./water-properties";

/**
 * Ambient range: outdoor daily means on inhabited land lie well inside
 * −50 to +50 °C [memory: records are about −68 and +57 °C for extremes, not
 * means], so anything outside is a unit or sign slip (°F, K).
 */
export const AMBIENT_RANGE_C = { min: -50, max: 50 } as const;

export interface WaterExergyInput {
  massKg: number;
  flowTempC: number;
  returnTempC: number;
  flowEnthalpyKjPerKg: number;
  returnEnthalpyKjPerKg: number;
  flowEntropyKjPerKgK: number;
  returnEntropyKjPerKgK: number;
  ambientTempC: number;
}

function requireUsefulAmbient(input: WaterExergyInput): void {
  const { flowTempC: tf, returnTempC: tr, ambientTempC: t0 } = input;
  if (tf > tr && t0 >= tf) {
    throw new PhysicsRangeError(
      `${t0} °C is not below the flow temperature ${tf} °C: for a heating ` +
        `flow (flow warmer than return) the ambient must be below the flow, ` +
        `${AMBIENT_RANGE_C.min} °C to under ${tf} °C`,
      "ambientTempC",
    );
  }
  if (tf < tr && t0 <= tf) {
    throw new PhysicsRangeError(
      `${t0} °C is not above the flow temperature ${tf} °C: for a chilled ` +
        `flow (flow colder than return) the ambient must be above the flow, ` +
        `over ${tf} °C to ${AMBIENT_RANGE_C.max} °C`,
      "ambientTempC",
    );
  }
}

/** Exergy delivered, kJ: positive when it enters the site. */
export function waterExergyKj(input: WaterExergyInput): number {
  requireNonNegative("massKg", input.massKg);
  requireInRange("ambientTempC", input.ambientTempC, AMBIENT_RANGE_C, "°C");
  requireUsefulAmbient(input);
  const t0K = input.ambientTempC + CELSIUS_OFFSET_K;
  const dh = input.flowEnthalpyKjPerKg - input.returnEnthalpyKjPerKg;
  const ds = input.flowEntropyKjPerKgK - input.returnEntropyKjPerKgK;
  return input.massKg * (dh - t0K * ds);
}
