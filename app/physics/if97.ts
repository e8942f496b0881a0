// IAPWS-IF97, the industrial formulation for water and steam, implemented
// from IAPWS R7-97(2012), "Revised Release on the IAPWS Industrial
// Formulation 1997 for the Thermodynamic Properties of Water and Steam".
//
// Only what a heat or steam meter needs: region 1 (liquid, Eq. 7 with
// Table 2), region 2 (vapour, Eq. 15 with Tables 10 and 11), region 4 (the
// saturation line, Eqs. 30 and 31 with Table 34) and the region 2/3
// boundary (Eq. 5 with Table 1), which bounds region 2 above 623.15 K.
//
// These are the "formulation" functions: they accept the whole IF97 validity
// of each region, so that the release's verification points (Tables 5, 15,
// 35, 36) can be checked. Meter-facing code goes through water-properties.ts,
// which narrows the range to what heat and steam meters meet.
//
// Units follow the release: pressure in MPa, temperature in K, energies in
// kJ/kg; volume in m³/kg and speed of sound in m/s.

import { PhysicsRangeError, requireFinite } from "./errors";
import { region1FirstOrderSums } from "./if97-region1-sums.generated";

// Specific gas constant of water, IF97 Eq. 1, kJ/(kg·K).
export const IF97_R_KJ_PER_KG_K = 0.461526;
// Critical point, IF97 Eqs. 2-4.
export const IF97_CRITICAL_TEMPERATURE_K = 647.096;
export const IF97_CRITICAL_PRESSURE_MPA = 22.064;

const T_MIN_K = 273.15;
const T_REGION1_MAX_K = 623.15;
const T_REGION2_B23_MAX_K = 863.15;
const T_REGION2_MAX_K = 1073.15;
const P_MAX_MPA = 100;

// A state computed exactly on the saturation line (e.g. region 1 at
// T_s(p)) must pass the phase guard although Eqs. 30 and 31 only invert each
// other to rounding; 1e-9 relative in pressure is far below any measurement.
const SATURATION_RELATIVE_TOLERANCE = 1e-9;

export interface WaterProperties {
  specificVolumeM3PerKg: number;
  densityKgPerM3: number;
  enthalpyKjPerKg: number;
  internalEnergyKjPerKg: number;
  entropyKjPerKgK: number;
  isobaricHeatCapacityKjPerKgK: number;
  speedOfSoundMPerS: number;
}

// [I, J, n] of IF97 Table 2 (region 1, Eq. 7). Exported, with the region-2
// tables, for the test that holds the fast evaluation to the term-by-term sum.
export const REGION1: ReadonlyArray<readonly [number, number, number]> = [
  [0, -2, 0.14632971213167],
  [0, -1, -0.84548187169114],
  [0, 0, -0.3756360367204e1],
  [0, 1, 0.33855169168385e1],
  [0, 2, -0.95791963387872],
  [0, 3, 0.15772038513228],
  [0, 4, -0.16616417199501e-1],
  [0, 5, 0.81214629983568e-3],
  [1, -9, 0.28319080123804e-3],
  [1, -7, -0.60706301565874e-3],
  [1, -1, -0.18990068218419e-1],
  [1, 0, -0.32529748770505e-1],
  [1, 1, -0.21841717175414e-1],
  [1, 3, -0.5283835796993e-4],
  [2, -3, -0.47184321073267e-3],
  [2, 0, -0.30001780793026e-3],
  [2, 1, 0.47661393906987e-4],
  [2, 3, -0.44141845330846e-5],
  [2, 17, -0.72694996297594e-15],
  [3, -4, -0.31679644845054e-4],
  [3, 0, -0.28270797985312e-5],
  [3, 6, -0.85205128120103e-9],
  [4, -5, -0.22425281908e-5],
  [4, -2, -0.65171222895601e-6],
  [4, 10, -0.14341729937924e-12],
  [5, -8, -0.40516996860117e-6],
  [8, -11, -0.12734301741641e-8],
  [8, -6, -0.17424871230634e-9],
  [21, -29, -0.68762131295531e-18],
  [23, -31, 0.14478307828521e-19],
  [29, -38, 0.26335781662795e-22],
  [30, -39, -0.11947622640071e-22],
  [31, -40, 0.18228094581404e-23],
  [32, -41, -0.93537087292458e-25],
];

// [J, n] of IF97 Table 10 (region 2, ideal-gas part, Eq. 16).
export const REGION2_IDEAL: ReadonlyArray<readonly [number, number]> = [
  [0, -0.96927686500217e1],
  [1, 0.10086655968018e2],
  [-5, -0.5608791128302e-2],
  [-4, 0.71452738081455e-1],
  [-3, -0.40710498223928],
  [-2, 0.14240819171444e1],
  [-1, -0.4383951131945e1],
  [2, -0.28408632460772],
  [3, 0.21268463753307e-1],
];

// [I, J, n] of IF97 Table 11 (region 2, residual part, Eq. 17).
export const REGION2_RESIDUAL: ReadonlyArray<
  readonly [number, number, number]
> = [
  [1, 0, -0.17731742473213e-2],
  [1, 1, -0.17834862292358e-1],
  [1, 2, -0.45996013696365e-1],
  [1, 3, -0.57581259083432e-1],
  [1, 6, -0.5032527872793e-1],
  [2, 1, -0.33032641670203e-4],
  [2, 2, -0.18948987516315e-3],
  [2, 4, -0.39392777243355e-2],
  [2, 7, -0.43797295650573e-1],
  [2, 36, -0.26674547914087e-4],
  [3, 0, 0.20481737692309e-7],
  [3, 1, 0.43870667284435e-6],
  [3, 3, -0.3227767723857e-4],
  [3, 6, -0.15033924542148e-2],
  [3, 35, -0.40668253562649e-1],
  [4, 1, -0.78847309559367e-9],
  [4, 2, 0.12790717852285e-7],
  [4, 3, 0.48225372718507e-6],
  [5, 7, 0.22922076337661e-5],
  [6, 3, -0.16714766451061e-10],
  [6, 16, -0.21171472321355e-2],
  [6, 35, -0.23895741934104e2],
  [7, 0, -0.5905956432427e-17],
  [7, 11, -0.12621808899101e-5],
  [7, 25, -0.38946842435739e-1],
  [8, 8, 0.11256211360459e-10],
  [8, 36, -0.82311340897998e1],
  [9, 13, 0.19809712802088e-7],
  [10, 4, 0.10406965210174e-18],
  [10, 10, -0.10234747095929e-12],
  [10, 14, -0.10018179379511e-8],
  [16, 29, -0.80882908646985e-10],
  [16, 50, 0.10693031879409],
  [18, 57, -0.33662250574171],
  [20, 20, 0.89185845355421e-24],
  [20, 35, 0.30629316876232e-12],
  [20, 48, -0.42002467698208e-5],
  [21, 21, -0.59056029685639e-25],
  [22, 53, 0.37826947613457e-5],
  [23, 39, -0.12768608934681e-14],
  [24, 26, 0.73087610595061e-28],
  [24, 40, 0.55414715350778e-16],
  [24, 58, -0.9436970724121e-6],
];

// n1..n10 of IF97 Table 34 (region 4, Eqs. 28-31), index 0 unused so the
// indices read as in the release.
const SAT = [
  0, 0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2,
  0.1202082470247e5, -0.32325550322333e7, 0.1491510861353e2,
  -0.48232657361591e4, 0.40511340542057e6, -0.23855557567849,
  0.65017534844798e3,
] as const;

// n1..n3 of IF97 Table 1 (the B23 boundary, Eq. 5).
const B23 = [
  0.34805185628969e3, -0.11671859879975e1, 0.10192970039326e-2,
] as const;

// The tables above, as the release prints them, are the source of truth; the
// hot loops read the same numbers from flat typed arrays built once here, so
// an evaluation walks plain doubles and integers with no iterator, no
// destructuring and no allocation.
function column<T extends ReadonlyArray<number>>(
  table: ReadonlyArray<T>,
  index: number,
): Float64Array {
  return Float64Array.from(table, (row) => row[index]);
}

const R1_I = Int32Array.from(REGION1, (row) => row[0]);
const R1_J = Int32Array.from(REGION1, (row) => row[1]);
const R1_N = column(REGION1, 2);
const R2O_J = Int32Array.from(REGION2_IDEAL, (row) => row[0]);
const R2O_N = column(REGION2_IDEAL, 1);
const R2R_I = Int32Array.from(REGION2_RESIDUAL, (row) => row[0]);
const R2R_J = Int32Array.from(REGION2_RESIDUAL, (row) => row[1]);
const R2R_N = column(REGION2_RESIDUAL, 2);

function maxOf(values: Int32Array): number {
  return values.reduce((m, v) => Math.max(m, v), 0);
}
function minOf(values: Int32Array): number {
  return values.reduce((m, v) => Math.min(m, v), 0);
}

// Integer powers x^k for k = kMin..kMax, stored at index k − kMin, by
// repeated multiplication from x^0 = 1 both ways: one multiplication per
// power instead of one Math.pow per term. Rounding grows by at most one ulp
// per step (≤ 58 ulp ≈ 1e-14 relative at the highest powers), far inside the
// release's nine digits and the 1e-12 the tests hold it to.
function fillPowers(
  out: Float64Array,
  x: number,
  kMin: number,
  kMax: number,
): void {
  out[-kMin] = 1;
  let up = 1;
  for (let k = 1; k <= kMax; k++) out[k - kMin] = up *= x;
  const inverse = 1 / x;
  let down = 1;
  for (let k = -1; k >= kMin; k--) out[k - kMin] = down *= inverse;
}

// Scratch buffers shared by every call: JavaScript runs one call at a time
// per thread, and each call fills what it reads before reading it.
const R1_I_MAX = maxOf(R1_I);
const R1_J_MIN = minOf(R1_J);
const R1_J_MAX = maxOf(R1_J);
const R2O_J_MIN = minOf(R2O_J);
const R2O_J_MAX = maxOf(R2O_J);
const R2R_I_MAX = maxOf(R2R_I);
const R2R_J_MAX = maxOf(R2R_J);
const R1_A_POWERS = new Float64Array(R1_I_MAX + 1);
const R1_B_POWERS = new Float64Array(R1_J_MAX - R1_J_MIN + 1);
const R2_TAU_POWERS = new Float64Array(R2O_J_MAX - R2O_J_MIN + 1);
const R2_PI_POWERS = new Float64Array(R2R_I_MAX + 1);
const R2_B_POWERS = new Float64Array(R2R_J_MAX + 1);

// Dimensionless Gibbs free energy and its derivatives, the raw material of
// every property relation (IF97 Tables 4 and 12), written into a reused
// record by the functions below.
interface Gibbs {
  g: number;
  gP: number;
  gPP: number;
  gT: number;
  gTT: number;
  gPT: number;
}

function gibbsRecord(): Gibbs {
  return { g: 0, gP: 0, gPP: 0, gT: 0, gTT: 0, gPT: 0 };
}

const REGION1_GIBBS = gibbsRecord();
const REGION2_IDEAL_GIBBS = gibbsRecord();
const REGION2_RESIDUAL_GIBBS = gibbsRecord();

// Each term's derivatives are the term itself times i/a, j/b and their
// products, so the derivatives come from the same pass as γ (a and b never
// vanish in the region's validity: a = 7.1 − π ≥ 1.05, b = τ − 1.222 ≥ 1.0).
function region1Gibbs(pi: number, tau: number): Gibbs {
  const a = 7.1 - pi;
  const b = tau - 1.222;
  fillPowers(R1_A_POWERS, a, 0, R1_I_MAX);
  fillPowers(R1_B_POWERS, b, R1_J_MIN, R1_J_MAX);
  let g = 0;
  let gP = 0;
  let gPP = 0;
  let gT = 0;
  let gTT = 0;
  let gPT = 0;
  for (let k = 0; k < R1_N.length; k++) {
    const i = R1_I[k];
    const j = R1_J[k];
    const t = R1_N[k] * R1_A_POWERS[i] * R1_B_POWERS[j - R1_J_MIN];
    g += t;
    gP -= i * t;
    gPP += i * (i - 1) * t;
    gT += j * t;
    gTT += j * (j - 1) * t;
    gPT -= i * j * t;
  }
  // The common factors 1/a, 1/b of every term's derivative, applied once.
  const r = REGION1_GIBBS;
  r.g = g;
  r.gP = gP / a;
  r.gPP = gPP / (a * a);
  r.gT = gT / b;
  r.gTT = gTT / (b * b);
  r.gPT = gPT / (a * b);
  return r;
}

function region2IdealGibbs(pi: number, tau: number): Gibbs {
  // ln(pi) carries all the pressure dependence, so gPT is zero.
  fillPowers(R2_TAU_POWERS, tau, R2O_J_MIN, R2O_J_MAX);
  let g = Math.log(pi);
  let gT = 0;
  let gTT = 0;
  for (let k = 0; k < R2O_N.length; k++) {
    const j = R2O_J[k];
    const t = R2O_N[k] * R2_TAU_POWERS[j - R2O_J_MIN];
    g += t;
    gT += j * t;
    gTT += j * (j - 1) * t;
  }
  const r = REGION2_IDEAL_GIBBS;
  r.g = g;
  r.gP = 1 / pi;
  r.gPP = -1 / (pi * pi);
  r.gT = gT / tau;
  r.gTT = gTT / (tau * tau);
  r.gPT = 0;
  return r;
}

// As for region 1: π > 0 and b = τ − 0.5 > 0 throughout region 2.
function region2ResidualGibbs(pi: number, tau: number): Gibbs {
  const b = tau - 0.5;
  fillPowers(R2_PI_POWERS, pi, 0, R2R_I_MAX);
  fillPowers(R2_B_POWERS, b, 0, R2R_J_MAX);
  let g = 0;
  let gP = 0;
  let gPP = 0;
  let gT = 0;
  let gTT = 0;
  let gPT = 0;
  for (let k = 0; k < R2R_N.length; k++) {
    const i = R2R_I[k];
    const j = R2R_J[k];
    const t = R2R_N[k] * R2_PI_POWERS[i] * R2_B_POWERS[j];
    g += t;
    gP += i * t;
    gPP += i * (i - 1) * t;
    gT += j * t;
    gTT += j * (j - 1) * t;
    gPT += i * j * t;
  }
  const r = REGION2_RESIDUAL_GIBBS;
  r.g = g;
  r.gP = gP / pi;
  r.gPP = gPP / (pi * pi);
  r.gT = gT / b;
  r.gTT = gTT / (b * b);
  r.gPT = gPT / (pi * b);
  return r;
}

/**
 * Density, enthalpy and entropy of two liquid states at one pressure: what a
 * heat meter's flow and return need, and nothing more.
 */
export interface LiquidPair {
  firstDensityKgPerM3: number;
  firstEnthalpyKjPerKg: number;
  firstEntropyKjPerKgK: number;
  secondDensityKgPerM3: number;
  secondEnthalpyKjPerKg: number;
  secondEntropyKjPerKgK: number;
}

/** A LiquidPair to fill, all zero. */
export function liquidPairRecord(): LiquidPair {
  return {
    firstDensityKgPerM3: 0,
    firstEnthalpyKjPerKg: 0,
    firstEntropyKjPerKgK: 0,
    secondDensityKgPerM3: 0,
    secondEnthalpyKjPerKg: 0,
    secondEntropyKjPerKgK: 0,
  };
}

// γ, γπ·a and γτ·b of region 1, unrolled (the generated module says why).
const R1_SUMS = new Float64Array(3);
// ρ, h and s of one liquid state: ρ needs γπ, h needs γτ and s needs γ and
// γτ, so the second derivatives (cp, w) are not summed at all.
const R1_LIQUID = new Float64Array(3);

function region1Liquid(pMpa: number, tK: number): Float64Array {
  const pi = pMpa / 16.53;
  const tau = 1386 / tK;
  const a = 7.1 - pi;
  const b = tau - 1.222;
  region1FirstOrderSums(a, b, R1_SUMS);
  const gP = R1_SUMS[1] / a;
  const gT = R1_SUMS[2] / b;
  const rt = IF97_R_KJ_PER_KG_K * tK;
  // 1 / v with v as region1Unchecked writes it, so ρ is bit for bit its ρ.
  R1_LIQUID[0] = 1 / ((rt * 1000 * pi * gP) / (pMpa * 1e6));
  R1_LIQUID[1] = rt * tau * gT;
  R1_LIQUID[2] = IF97_R_KJ_PER_KG_K * (tau * gT - R1_SUMS[0]);
  return R1_LIQUID;
}

/**
 * Region 1 at (p, T₁) and (p, T₂) for a caller that has established both
 * states are in region 1 (as for region1PropertiesInRange). The same sums
 * as region1Properties in the same order, so ρ, h and s are the same
 * numbers to the last bit; no record is made: the figures go into `out`.
 */
export function region1LiquidPairInRange(
  pressureMpa: number,
  firstK: number,
  secondK: number,
  out: LiquidPair,
): void {
  let state = region1Liquid(pressureMpa, firstK);
  out.firstDensityKgPerM3 = state[0];
  out.firstEnthalpyKjPerKg = state[1];
  out.firstEntropyKjPerKgK = state[2];
  state = region1Liquid(pressureMpa, secondK);
  out.secondDensityKgPerM3 = state[0];
  out.secondEnthalpyKjPerKg = state[1];
  out.secondEntropyKjPerKgK = state[2];
}

// Region 1 relations of IF97 Table 3; R·T in kJ/kg, ×1000 for J/kg where
// the relation mixes in the pressure in Pa (v, w).
function region1Unchecked(pMpa: number, tK: number): WaterProperties {
  const pi = pMpa / 16.53;
  const tau = 1386 / tK;
  const y = region1Gibbs(pi, tau);
  const rt = IF97_R_KJ_PER_KG_K * tK;
  const dPT = y.gP - tau * y.gPT;
  const wSquared =
    (rt * 1000 * y.gP * y.gP) / ((dPT * dPT) / (tau * tau * y.gTT) - y.gPP);
  const v = (rt * 1000 * pi * y.gP) / (pMpa * 1e6);
  return {
    specificVolumeM3PerKg: v,
    enthalpyKjPerKg: rt * tau * y.gT,
    internalEnergyKjPerKg: rt * (tau * y.gT - pi * y.gP),
    entropyKjPerKgK: IF97_R_KJ_PER_KG_K * (tau * y.gT - y.g),
    isobaricHeatCapacityKjPerKgK: -IF97_R_KJ_PER_KG_K * tau * tau * y.gTT,
    speedOfSoundMPerS: Math.sqrt(wSquared),
    densityKgPerM3: 1 / v,
  };
}

// Region 2 relations of IF97 Table 12 (ideal-gas part o, residual part r).
function region2Unchecked(pMpa: number, tK: number): WaterProperties {
  const pi = pMpa;
  const tau = 540 / tK;
  const o = region2IdealGibbs(pi, tau);
  const r = region2ResidualGibbs(pi, tau);
  const rt = IF97_R_KJ_PER_KG_K * tK;
  const gT = o.gT + r.gT;
  const gTT = o.gTT + r.gTT;
  const piGp = pi * r.gP;
  const dPT = 1 + piGp - tau * pi * r.gPT;
  const wSquared =
    (rt * 1000 * (1 + 2 * piGp + piGp * piGp)) /
    (1 - pi * pi * r.gPP + (dPT * dPT) / (tau * tau * gTT));
  const v = (rt * 1000 * pi * (o.gP + r.gP)) / (pMpa * 1e6);
  return {
    specificVolumeM3PerKg: v,
    enthalpyKjPerKg: rt * tau * gT,
    internalEnergyKjPerKg: rt * (tau * gT - pi * (o.gP + r.gP)),
    entropyKjPerKgK: IF97_R_KJ_PER_KG_K * (tau * gT - (o.g + r.g)),
    isobaricHeatCapacityKjPerKgK: -IF97_R_KJ_PER_KG_K * tau * tau * gTT,
    speedOfSoundMPerS: Math.sqrt(wSquared),
    densityKgPerM3: 1 / v,
  };
}

// IF97 Eq. 30 (T* = 1 K, p* = 1 MPa).
// Squares written as products: it sits on every region-1 guard, and `** 2`
// may go through Math.pow where a product is one multiplication.
function saturationPressureUnchecked(tK: number): number {
  const theta = tK + SAT[9] / (tK - SAT[10]);
  const theta2 = theta * theta;
  const a = theta2 + SAT[1] * theta + SAT[2];
  const b = SAT[3] * theta2 + SAT[4] * theta + SAT[5];
  const c = SAT[6] * theta2 + SAT[7] * theta + SAT[8];
  const root = (2 * c) / (-b + Math.sqrt(b * b - 4 * a * c));
  const root2 = root * root;
  return root2 * root2;
}

// IF97 Eq. 31.
function saturationTemperatureUnchecked(pMpa: number): number {
  const beta = pMpa ** 0.25;
  const e = beta ** 2 + SAT[3] * beta + SAT[6];
  const f = SAT[1] * beta ** 2 + SAT[4] * beta + SAT[7];
  const g = SAT[2] * beta ** 2 + SAT[5] * beta + SAT[8];
  const d = (2 * g) / (-f - Math.sqrt(f ** 2 - 4 * e * g));
  const n10d = SAT[10] + d;
  return (n10d - Math.sqrt(n10d ** 2 - 4 * (SAT[9] + SAT[10] * d))) / 2;
}

// Region 4 runs from 273.15 K to the critical point (IF97 §8.1); its
// lower pressure end is Eq. 30 at 273.15 K (611.213 Pa).
export const IF97_SATURATION_MIN_PRESSURE_MPA =
  saturationPressureUnchecked(T_MIN_K);

function requireBetween(
  field: string,
  value: number,
  min: number,
  max: number,
  what: string,
): void {
  requireFinite(field, value);
  if (value < min || value > max) {
    throw new PhysicsRangeError(
      `${value} is outside ${what} (${min} to ${max})`,
      field,
    );
  }
}

/** Saturation pressure p_s(T), IF97 Eq. 30, valid 273.15 K to 647.096 K. */
export function saturationPressureMpa(temperatureK: number): number {
  requireBetween(
    "temperatureK",
    temperatureK,
    T_MIN_K,
    IF97_CRITICAL_TEMPERATURE_K,
    "the IF97 saturation line, K",
  );
  return saturationPressureUnchecked(temperatureK);
}

/**
 * p_s(T) for a caller that has itself checked T lies on the saturation line
 * (273.15 K to 647.096 K): no guard of its own on the heat meter's path.
 */
export function saturationPressureInRangeMpa(temperatureK: number): number {
  return saturationPressureUnchecked(temperatureK);
}

/** Saturation temperature T_s(p), IF97 Eq. 31, 611.213 Pa to 22.064 MPa. */
export function saturationTemperatureK(pressureMpa: number): number {
  requireBetween(
    "pressureMpa",
    pressureMpa,
    IF97_SATURATION_MIN_PRESSURE_MPA,
    IF97_CRITICAL_PRESSURE_MPA,
    "the IF97 saturation line, MPa",
  );
  return saturationTemperatureUnchecked(pressureMpa);
}

/** Pressure on the region 2/3 boundary, IF97 Eq. 5, 623.15 K to 863.15 K. */
export function boundary23PressureMpa(temperatureK: number): number {
  requireBetween(
    "temperatureK",
    temperatureK,
    T_REGION1_MAX_K,
    T_REGION2_B23_MAX_K,
    "the IF97 B23 boundary, K",
  );
  return B23[0] + B23[1] * temperatureK + B23[2] * temperatureK ** 2;
}

/**
 * Liquid water, IF97 region 1: 273.15 K ≤ T ≤ 623.15 K and
 * p_s(T) ≤ p ≤ 100 MPa (IF97 §5.1). Outside that, a PhysicsRangeError.
 */
export function region1Properties(
  pressureMpa: number,
  temperatureK: number,
): WaterProperties {
  const range = "IF97 region 1, K";
  requireBetween("temperatureK", temperatureK, T_MIN_K, T_REGION1_MAX_K, range);
  const psMpa = saturationPressureUnchecked(temperatureK);
  const minMpa = psMpa * (1 - SATURATION_RELATIVE_TOLERANCE);
  requireFinite("pressureMpa", pressureMpa);
  if (pressureMpa < minMpa || pressureMpa > P_MAX_MPA) {
    throw new PhysicsRangeError(
      `${pressureMpa} MPa is outside IF97 region 1 at ${temperatureK} K ` +
        `(liquid needs p_s(T) = ${psMpa} MPa to ${P_MAX_MPA} MPa)`,
      "pressureMpa",
    );
  }
  return region1Unchecked(pressureMpa, temperatureK);
}

/**
 * Region 1 for a caller that has itself established, with the same
 * saturation test, that (p, T) lies inside region 1 (water-properties.ts
 * checks the meter range and the phase first): skips a second evaluation of
 * the saturation line on the hottest path. Anything else calls
 * region1Properties.
 */
export function region1PropertiesInRange(
  pressureMpa: number,
  temperatureK: number,
): WaterProperties {
  return region1Unchecked(pressureMpa, temperatureK);
}

// The upper pressure of region 2 at T: the saturation line up to 623.15 K,
// then the B23 boundary, then 100 MPa (IF97 §6.1).
function region2MaxPressureMpa(tK: number): number {
  if (tK <= T_REGION1_MAX_K) {
    return (
      saturationPressureUnchecked(tK) * (1 + SATURATION_RELATIVE_TOLERANCE)
    );
  }
  if (tK <= T_REGION2_B23_MAX_K) return boundary23PressureMpa(tK);
  return P_MAX_MPA;
}

/**
 * Steam, IF97 region 2: 273.15 K ≤ T ≤ 1073.15 K and 0 < p ≤ the region's
 * upper pressure at T (IF97 §6.1). Outside that, a PhysicsRangeError.
 */
export function region2Properties(
  pressureMpa: number,
  temperatureK: number,
): WaterProperties {
  const range = "IF97 region 2, K";
  requireBetween("temperatureK", temperatureK, T_MIN_K, T_REGION2_MAX_K, range);
  const maxMpa = region2MaxPressureMpa(temperatureK);
  requireFinite("pressureMpa", pressureMpa);
  if (pressureMpa <= 0 || pressureMpa > maxMpa) {
    throw new PhysicsRangeError(
      `${pressureMpa} MPa is outside IF97 region 2 at ${temperatureK} K ` +
        `(steam needs 0 MPa < p ≤ ${maxMpa} MPa)`,
      "pressureMpa",
    );
  }
  return region2Unchecked(pressureMpa, temperatureK);
}
