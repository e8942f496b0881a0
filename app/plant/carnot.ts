/**
 * The second law's limits for plant that moves heat with work, and the work
 * value (exergy) of heat at a temperature. Temperatures in °C at the edges,
 * kelvin inside. Pure arithmetic.
 */

const KELVIN_OFFSET = 273.15;

export function kelvin(celsius: number): number {
  return celsius + KELVIN_OFFSET;
}

/**
 * Carnot COP of a heat pump lifting heat from a source at `sourceC` to a
 * sink at `sinkC`: T_sink / (T_sink − T_source) [textbook; references.md §9].
 * Infinite when the sink is no warmer than the source: heat then flows by
 * itself and the law sets no limit.
 */
export function carnotHeatingCop(sinkC: number, sourceC: number): number {
  const lift = sinkC - sourceC;
  return lift <= 0 ? Infinity : kelvin(sinkC) / lift;
}

/**
 * Carnot COP (EER) of a chiller taking heat from chilled water at `coldC`
 * and rejecting it at `rejectC`: T_cold / (T_reject − T_cold) [textbook].
 */
export function carnotCoolingCop(coldC: number, rejectC: number): number {
  const lift = rejectC - coldC;
  return lift <= 0 ? Infinity : kelvin(coldC) / lift;
}

/**
 * The thermodynamic mean temperature of water cooled from `fromC` to `toC`
 * at constant specific heat: (T₁ − T₂) / ln(T₁/T₂) in kelvin [computed from
 * the closed form of references.md §9]. The arithmetic mean when they are equal.
 */
export function meanTemperatureK(fromC: number, toC: number): number {
  const t1 = kelvin(fromC);
  const t2 = kelvin(toC);
  return t1 === t2 ? t1 : (t1 - t2) / Math.log(t1 / t2);
}

/**
 * The exergy of heat `heatKwh` exchanged by water between `flowC` and
 * `returnC`, against a dead state at `deadStateC`: Q·|1 − T₀/T_m|. Heat
 * above the dead state and cold below it both carry work potential, so the
 * result is ≥ 0 for heat delivered and for cooling delivered alike.
 */
export function heatExergyKwh(
  heatKwh: number,
  flowC: number,
  returnC: number,
  deadStateC: number,
): number {
  const carnotFactor =
    1 - kelvin(deadStateC) / meanTemperatureK(flowC, returnC);
  return Math.abs(heatKwh * carnotFactor);
}
