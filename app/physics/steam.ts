// Heat given up by condensing steam: Q = m · (h″(p) − h_condensate).
// Saturated steam has one degree of freedom (Gibbs phase rule,
// F = C − P + 2 = 1 − 2 + 2 = 1): pressure and saturation temperature are
// two names for one state, so when a reading gives both they must agree.

import {
  PhysicsInputError,
  PhysicsRangeError,
  requireFinite,
  requireNonNegative,
} from "./errors";
import {
  absolutePressureBar,
  liquidUpToSaturation,
  saturationAtPressure,
  saturationPressureBarAbs,
  saturationTemperatureC,
} from "./water-properties";

/**
 * How far (in K) a given saturation temperature may sit from T_s(p), and a
 * condensate temperature above T_s(p), before the reading is rejected.
 * 1 K absorbs honest disagreement: the weather moves the barometer some
 * ±30 hPa around the standard atmosphere used for gauge readings (common
 * practice), which shifts T_s by about ±0.8 K near atmospheric pressure
 * (dT_s/dp ≈ 27.6 K/bar there) [computed, IF97], and
 * a class A Pt100 is allowed ±(0.15 + 0.002·|t|) K, ±0.5 K at 170 °C
 * [memory: IEC 60751]. It still catches the usual gross error, a gauge
 * pressure read as absolute (or the reverse): that shifts T_s by at least
 * 1.5 K anywhere up to 40 bar a [computed, IF97; see steam.test.ts].
 */
export const PHASE_RULE_TOLERANCE_K = 1.0;

/**
 * A condensate temperature this close to T_s(p) is at saturation. T_s comes
 * back from p through IF97 Eqs. 30-31 with a rounding error of order 1e-12 K
 * (180 °C returns as 180.0000000000005 °C), so an exact comparison would call
 * condensate reported at the saturation temperature subcooled, or above it.
 * 1e-6 K is far below any thermometer's resolution.
 */
export const AT_SATURATION_K = 1e-6;

export interface SteamStateInput {
  pressureBarAbs?: number;
  pressureBarG?: number;
  saturationTempC?: number;
}

export interface SaturatedSteamState {
  pressureBarAbs: number;
  saturationTempC: number;
  /** Which given value fixed the state; the others only had to agree. */
  source: keyof SteamStateInput;
}

interface Candidate {
  field: keyof SteamStateInput;
  pressureBarAbs: number;
  saturationTempC: number;
}

// Each given state variable, turned into (p, T_s); pressures first because a
// pressure transmitter is the usual primary instrument on a steam main.
function candidates(s: SteamStateInput): Candidate[] {
  const out: Candidate[] = [];
  if (s.pressureBarAbs !== undefined)
    out.push(fromPressure("pressureBarAbs", s.pressureBarAbs));
  if (s.pressureBarG !== undefined) {
    out.push(fromPressure("pressureBarG", absolutePressureBar(s.pressureBarG)));
  }
  if (s.saturationTempC !== undefined) {
    const t = s.saturationTempC;
    const p = saturationPressureBarAbs(t, "saturationTempC");
    out.push({
      field: "saturationTempC",
      pressureBarAbs: p,
      saturationTempC: t,
    });
  }
  return out;
}

function fromPressure(
  field: keyof SteamStateInput,
  pBarAbs: number,
): Candidate {
  const t = saturationTemperatureC(pBarAbs, field);
  return { field, pressureBarAbs: pBarAbs, saturationTempC: t };
}

const LABEL: Record<keyof SteamStateInput, string> = {
  pressureBarAbs: "the absolute pressure",
  pressureBarG: "the gauge pressure",
  saturationTempC: "the saturation temperature",
};

function requireAgreement(a: Candidate, b: Candidate): void {
  const gap = Math.abs(a.saturationTempC - b.saturationTempC);
  if (gap <= PHASE_RULE_TOLERANCE_K) return;
  throw new PhysicsRangeError(
    `gives a saturation temperature of ${b.saturationTempC.toFixed(2)} °C, ` +
      `${gap.toFixed(2)} K away from the ${a.saturationTempC.toFixed(2)} °C ` +
      `that ${LABEL[a.field]} gives; saturated steam has one degree of ` +
      `freedom (Gibbs phase rule), so they must agree within ` +
      `${PHASE_RULE_TOLERANCE_K} K`,
    b.field,
  );
}

/** The saturated state fixed by p (abs or gauge) and/or T_s, phase-checked. */
export function resolveSaturatedSteam(
  input: SteamStateInput,
): SaturatedSteamState {
  const all = candidates(input);
  const first = all[0];
  if (first === undefined) {
    throw new PhysicsInputError(
      "no steam state given: saturated steam needs an absolute or gauge " +
        "pressure or a saturation temperature",
    );
  }
  for (let i = 0; i < all.length; i++) {
    for (let j = i + 1; j < all.length; j++) requireAgreement(all[i]!, all[j]!);
  }
  return {
    pressureBarAbs: first.pressureBarAbs,
    saturationTempC: first.saturationTempC,
    source: first.field,
  };
}

export type CondensateState =
  "saturated_liquid" | "subcooled_liquid" | "at_saturation_within_tolerance";

export interface SteamHeatInput extends SteamStateInput {
  massKg: number;
  condensateTempC?: number;
}

export interface SteamHeatResult {
  energyKj: number;
  pressureBarAbs: number;
  saturationTempC: number;
  /** h″, saturated vapour. */
  vapourEnthalpyKjPerKg: number;
  /** h′, saturated liquid. */
  liquidEnthalpyKjPerKg: number;
  /** h_fg = h″ − h′. */
  latentHeatKjPerKg: number;
  condensateEnthalpyKjPerKg: number;
  condensate: CondensateState;
}

interface Condensate {
  enthalpyKjPerKg: number;
  state: CondensateState;
}

// Condensate as liquid at its temperature and the steam pressure (IF97
// region 1); saturated liquid when no temperature is given or it is the
// saturation temperature. Condensate cannot be hotter than saturation: within
// the tolerance it is taken as saturated liquid (sensor noise), beyond it the
// reading is rejected. Its range follows the steam's: 0 °C to T_s(p).
function condensate(
  tC: number | undefined,
  pBarAbs: number,
  tsC: number,
  hfKjPerKg: number,
): Condensate {
  const saturated: Condensate = {
    enthalpyKjPerKg: hfKjPerKg,
    state: "saturated_liquid",
  };
  if (tC === undefined) return saturated;
  requireFinite("condensateTempC", tC);
  if (Math.abs(tC - tsC) <= AT_SATURATION_K) return saturated;
  if (tC > tsC + PHASE_RULE_TOLERANCE_K) {
    throw new PhysicsRangeError(
      `${tC} °C is hotter than the saturation temperature ` +
        `${tsC.toFixed(2)} °C at ${pBarAbs} bar a; condensate must be at or ` +
        `below saturation (within ${PHASE_RULE_TOLERANCE_K} K)`,
      "condensateTempC",
    );
  }
  if (tC > tsC) {
    return {
      enthalpyKjPerKg: hfKjPerKg,
      state: "at_saturation_within_tolerance",
    };
  }
  const h = liquidUpToSaturation(pBarAbs, tC, {
    temperature: "condensateTempC",
  });
  return { enthalpyKjPerKg: h.enthalpyKjPerKg, state: "subcooled_liquid" };
}

export function steamHeat(input: SteamHeatInput): SteamHeatResult {
  requireNonNegative("massKg", input.massKg);
  const state = resolveSaturatedSteam(input);
  const sat = saturationAtPressure(state.pressureBarAbs, state.source);
  const c = condensate(
    input.condensateTempC,
    sat.pressureBarAbs,
    sat.temperatureC,
    sat.liquidEnthalpyKjPerKg,
  );
  return {
    energyKj: input.massKg * (sat.vapourEnthalpyKjPerKg - c.enthalpyKjPerKg),
    pressureBarAbs: sat.pressureBarAbs,
    saturationTempC: sat.temperatureC,
    vapourEnthalpyKjPerKg: sat.vapourEnthalpyKjPerKg,
    liquidEnthalpyKjPerKg: sat.liquidEnthalpyKjPerKg,
    latentHeatKjPerKg: sat.latentHeatKjPerKg,
    condensateEnthalpyKjPerKg: c.enthalpyKjPerKg,
    condensate: c.state,
  };
}
