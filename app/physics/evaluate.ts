// Item logic of POST /api/v1/energy/evaluate, framework-free: each item is
// parsed on its own and evaluated with the physics core; the answer lists
// one result per item, in item order. Energies are those delivered to the
// load downstream of the meter (negative when the load gives energy off, as
// with chilled water); the site-boundary sign is applied later from the
// meter's orientation.

import type { z } from "zod";
import { differenceRegister, electricWork } from "./electric";
import { PhysicsError, PhysicsInputError } from "./errors";
import { EVALUATE_QUANTITIES, evaluateItemSchema } from "./evaluate-schema";
import type { EvaluateItem, EvaluateResult } from "./evaluate-schema";
import { CUBIC_METRES_PER_CUBIC_FOOT, gasVolumeEnergy } from "./gas-volume";
import type { LineConditions } from "./gas-volume";
import { hydrogenEnergy } from "./hydrogen";
import { liquidFuelEnergy } from "./liquid-fuel";
import type { StockBalance } from "./liquid-fuel";
import { sensibleHeatKj } from "./sensible-heat";
import { solidFuelEnergy } from "./solid-fuel";
import { steamHeat } from "./steam";
import { mpeBand } from "./uncertainty";
import { convertEnergy } from "./units";
import { waterExergyKj } from "./water-exergy";
import { waterHeat } from "./water-heat";
import type { WaterHeatResult } from "./water-heat";
import { absolutePressureBar } from "./water-properties";

export {
  evaluateItemSchema,
  evaluateRequestSchema,
  evaluateResponseSchema,
  evaluateResultSchema,
  MAX_EVALUATE_ITEMS,
} from "./evaluate-schema";
export type { EvaluateItem, EvaluateResult } from "./evaluate-schema";

type Details = Record<string, number | string | null>;
type ItemOf<Q extends EvaluateItem["quantity"]> = Extract<
  EvaluateItem,
  { quantity: Q }
>;

// Physics inputs are named in camelCase; the API names them in snake_case.
const API_FIELD: Record<string, string> = {
  volumeM3: "volume_m3",
  flowTempC: "flow_temp_c",
  returnTempC: "return_temp_c",
  pressureBarAbs: "pressure_bar_abs",
  pressureBarG: "pressure_bar_g",
  saturationTempC: "saturation_temp_c",
  condensateTempC: "condensate_temp_c",
  massKg: "mass_kg",
  specificHeatKjPerKgK: "specific_heat_kj_per_kg_k",
  inletTempC: "inlet_temp_c",
  outletTempC: "outlet_temp_c",
  powerFactor: "power_factor",
  voltageBasis: "voltage_basis",
  startKwh: "register_start_kwh",
  endKwh: "register_end_kwh",
  capacityKwh: "register_capacity_kwh",
  deltaThetaMinK: "delta_theta_min_k",
  flowM3PerH: "flow_m3_per_h",
  qpM3PerH: "qp_m3_per_h",
  meterClass: "meter_class",
  ambientTempC: "ambient_temp_c",
  calorificValueMjM3: "calorific_value_mj_m3",
  correctionFactor: "correction_factor",
  gasTempC: "gas_temp_c",
  gasPressureMbarG: "gas_pressure_mbar_g",
  atmosphericPressureMbar: "atmospheric_pressure_mbar",
  volumeL: "volume_l",
  openingStockL: "opening_stock_l",
  deliveriesL: "deliveries_l",
  closingStockL: "closing_stock_l",
  densityKgL: "density_kg_l",
  calorificValueMjKg: "calorific_value_mj_kg",
  volumeNm3: "volume_nm3",
  moisturePercent: "moisture_percent",
};

function fail(error: string): EvaluateResult {
  return { ok: false, error };
}

// `rename` overrides the mapping where one physics input stands for a choice
// of API fields (pressureBarAbs may have arrived as pressure_bar_g).
function physicsFailure(
  e: PhysicsError,
  rename: Record<string, string> = {},
): EvaluateResult {
  if (e.field === undefined) return fail(e.reason);
  const field = rename[e.field] ?? API_FIELD[e.field] ?? e.field;
  return fail(`${field}: ${e.reason}`);
}

/**
 * The item's fields that scale its energy. Finite inputs can still multiply
 * past the largest double (1e308 kg × 2000 kJ/kg); the reason then names the
 * item's own field (the largest of these), not a converter's argument.
 */
type ScaleFields = readonly string[];

function overflow(item: EvaluateItem, scale: ScaleFields): EvaluateResult {
  const values = item as unknown as Record<string, unknown>;
  const given = scale.filter((f) => typeof values[f] === "number");
  const field = given.reduce((a, b) =>
    Math.abs(values[b] as number) > Math.abs(values[a] as number) ? b : a,
  );
  return fail(
    `${field}: ${String(values[field])} makes the energy too large to ` +
      `represent (it overflows); check the item's figures and units`,
  );
}

// A loop rather than Object.values(...).every: no array per evaluated item.
function allFinite(details: Details): boolean {
  for (const key in details) {
    const v = details[key];
    if (typeof v === "number" && !Number.isFinite(v)) return false;
  }
  return true;
}

function success(
  item: EvaluateItem,
  scale: ScaleFields,
  kwh: number,
  method: string,
  details: Details,
): EvaluateResult {
  if (!Number.isFinite(kwh)) return overflow(item, scale);
  const mj = convertEnergy(kwh, "kWh", "MJ");
  if (!Number.isFinite(mj) || !allFinite(details)) return overflow(item, scale);
  return { ok: true as const, energy_kwh: kwh, energy_mj: mj, method, details };
}

function successKj(
  item: EvaluateItem,
  scale: ScaleFields,
  kj: number,
  method: string,
  details: Details,
): EvaluateResult {
  if (!Number.isFinite(kj)) return overflow(item, scale);
  return success(item, scale, convertEnergy(kj, "kJ", "kWh"), method, details);
}

function issueText(issue: z.core.$ZodIssue): string {
  if (issue.code === "unrecognized_keys") {
    return issue.keys.map((k) => `${k}: unknown field`).join("; ");
  }
  if (issue.code === "invalid_union" && issue.path.join(".") === "quantity") {
    return `quantity: must be one of ${EVALUATE_QUANTITIES.join(", ")}`;
  }
  if (issue.path.length === 0) return `item: ${issue.message}`;
  return `${issue.path.join(".")}: ${issue.message}`;
}

interface Timing {
  start?: string;
  end?: string;
  seconds?: number;
}

// The interval's duration from `seconds` or end − start; when both are
// given they must agree to the millisecond.
function durationSeconds(t: Timing): number | undefined {
  if ((t.start === undefined) !== (t.end === undefined)) {
    const [missing, given] =
      t.start === undefined ? ["start", "end"] : ["end", "start"];
    throw new PhysicsInputError(`is required when ${given} is given`, missing);
  }
  if (t.start === undefined || t.end === undefined) return t.seconds;
  const span = (Date.parse(t.end) - Date.parse(t.start)) / 1000;
  if (span <= 0) throw new PhysicsInputError("must be after start", "end");
  if (t.seconds !== undefined && Math.abs(t.seconds - span) > 0.001) {
    throw new PhysicsInputError(
      `${t.seconds} s disagrees with end − start = ${span} s`,
      "seconds",
    );
  }
  return span;
}

interface ItemPressure {
  pressureBarAbs: number;
  field: "pressure_bar_abs" | "pressure_bar_g";
}

function waterPressure(item: ItemOf<"water_heat">): ItemPressure {
  const abs = item.pressure_bar_abs;
  const gauge = item.pressure_bar_g;
  if (abs !== undefined && gauge !== undefined) {
    throw new PhysicsInputError(
      "give pressure_bar_abs or pressure_bar_g, not both",
      "pressure_bar_g",
    );
  }
  if (abs !== undefined)
    return { pressureBarAbs: abs, field: "pressure_bar_abs" };
  if (gauge !== undefined) {
    return {
      pressureBarAbs: absolutePressureBar(gauge),
      field: "pressure_bar_g",
    };
  }
  throw new PhysicsInputError(
    "is required (or pressure_bar_g)",
    "pressure_bar_abs",
  );
}

const MPE_FIELDS = [
  "delta_theta_min_k",
  "qp_m3_per_h",
  "flow_m3_per_h",
] as const;

// The flow rate for the MPE: given, or volume / duration.
function mpeFlowM3PerH(
  item: ItemOf<"water_heat">,
  seconds: number | undefined,
): number {
  if (item.flow_m3_per_h !== undefined) return item.flow_m3_per_h;
  if (seconds === undefined || seconds === 0) {
    throw new PhysicsInputError(
      "is required with meter_class when the item has no duration " +
        "(seconds, or start and end) to derive it from volume_m3",
      "flow_m3_per_h",
    );
  }
  return (item.volume_m3 / seconds) * 3600;
}

function requireMpeFields(item: ItemOf<"water_heat">) {
  if (item.meter_class === undefined) {
    const stray = MPE_FIELDS.find((f) => item[f] !== undefined);
    if (stray !== undefined) {
      throw new PhysicsInputError(`needs meter_class as well`, stray);
    }
    return undefined;
  }
  for (const f of ["delta_theta_min_k", "qp_m3_per_h"] as const) {
    if (item[f] === undefined) {
      throw new PhysicsInputError("is required with meter_class", f);
    }
  }
  return item.meter_class;
}

// Outside the meter's rated conditions the standard states no MPE, so the
// band is left out with the reason rather than extrapolated.
// The shared empty answer of mpeDetails for an item without EN 1434 fields.
const NO_DETAILS: Details = Object.freeze({});

function mpeNotApplicable(q: number, dThetaK: number, minK: number) {
  if (q <= 0) return "no flow in the interval";
  if (dThetaK < minK) return `Δθ below Δθmin (${minK} K)`;
  return null;
}

// EN 1434 MPE as a ± band on the energy, in kWh. Cooling (flow colder than
// return) uses |Δθ|: EN 1434 covers cooling meters, MID does not.
function mpeDetails(
  item: ItemOf<"water_heat">,
  energyKj: number,
  seconds: number | undefined,
): Details {
  const meterClass = requireMpeFields(item);
  if (meterClass === undefined) return NO_DETAILS;
  const q = mpeFlowM3PerH(item, seconds);
  const deltaThetaK = Math.abs(item.flow_temp_c - item.return_temp_c);
  const minK = item.delta_theta_min_k ?? 0;
  const base: Details = {
    en1434_flow_m3_per_h: q,
    en1434_delta_theta_k: deltaThetaK,
  };
  const why = mpeNotApplicable(q, deltaThetaK, minK);
  if (why !== null) {
    const note = `not applicable: ${why}`;
    return { ...base, en1434_mpe_percent: null, en1434_mpe_note: note };
  }
  const band = mpeBand(convertEnergy(energyKj, "kJ", "kWh"), {
    meterClass,
    deltaThetaK,
    deltaThetaMinK: minK,
    flowM3PerH: q,
    qpM3PerH: item.qp_m3_per_h ?? 0,
  });
  return {
    ...base,
    en1434_mpe_percent: band.mpePercent,
    energy_kwh_low: band.low,
    energy_kwh_high: band.high,
  };
}

function evaluateWaterHeat(item: ItemOf<"water_heat">): EvaluateResult {
  const seconds = durationSeconds(item);
  const p = waterPressure(item);
  let r: WaterHeatResult;
  try {
    r = waterHeat({
      volumeM3: item.volume_m3,
      flowTempC: item.flow_temp_c,
      returnTempC: item.return_temp_c,
      pressureBarAbs: p.pressureBarAbs,
      sensorAt: item.sensor_at,
    });
  } catch (e) {
    if (e instanceof PhysicsError)
      return physicsFailure(e, { pressureBarAbs: p.field });
    throw e;
  }
  // Before the MPE band, which would otherwise meet the overflow first.
  if (!Number.isFinite(r.energyKj)) return overflow(item, ["volume_m3"]);
  const details: Details = {
    pressure_bar_abs: p.pressureBarAbs,
    sensor_at: item.sensor_at,
    density_at_sensor_kg_per_m3: r.densityAtSensorKgPerM3,
    mass_kg: r.massKg,
    flow_enthalpy_kj_per_kg: r.flowEnthalpyKjPerKg,
    return_enthalpy_kj_per_kg: r.returnEnthalpyKjPerKg,
    k_factor_kwh_per_m3_k: r.kFactorKwhPerM3K,
  };
  // Added in place, in the same key order as before, and only when the item
  // asks for them: no throw-away objects on the common path.
  // The exergy is worked out first, as it always was, so that an item with
  // two faults keeps naming the same one.
  const exergy = exergyDetails(item, r);
  const mpe = mpeDetails(item, r.energyKj, seconds);
  if (mpe !== NO_DETAILS) Object.assign(details, mpe);
  if (exergy !== NO_DETAILS) Object.assign(details, exergy);
  return successKj(
    item,
    ["volume_m3"],
    r.energyKj,
    "iapws-if97/water-heat",
    details,
  );
}

// Exergy beside the energy when the item gives the dead state (water-exergy.ts
// explains the sign and the rule on the ambient).
function exergyDetails(
  item: ItemOf<"water_heat">,
  r: WaterHeatResult,
): Details {
  if (item.ambient_temp_c === undefined) return NO_DETAILS;
  const kj = waterExergyKj({
    massKg: r.massKg,
    flowTempC: item.flow_temp_c,
    returnTempC: item.return_temp_c,
    flowEnthalpyKjPerKg: r.flowEnthalpyKjPerKg,
    returnEnthalpyKjPerKg: r.returnEnthalpyKjPerKg,
    flowEntropyKjPerKgK: r.flowEntropyKjPerKgK,
    returnEntropyKjPerKgK: r.returnEntropyKjPerKgK,
    ambientTempC: item.ambient_temp_c,
  });
  return {
    ambient_temp_c: item.ambient_temp_c,
    flow_entropy_kj_per_kg_k: r.flowEntropyKjPerKgK,
    return_entropy_kj_per_kg_k: r.returnEntropyKjPerKgK,
    exergy_kwh: convertEnergy(kj, "kJ", "kWh"),
  };
}

// Exactly one of two fields that name the same amount in different units.
function oneOf<K extends string>(
  item: Partial<Record<K, number>>,
  first: K,
  second: K,
): K {
  const hasFirst = item[first] !== undefined;
  const hasSecond = item[second] !== undefined;
  if (hasFirst && hasSecond) {
    throw new PhysicsInputError(`give ${first} or ${second}, not both`, second);
  }
  if (!hasFirst && !hasSecond) {
    throw new PhysicsInputError(`is required (or ${second})`, first);
  }
  return hasFirst ? first : second;
}

// The line conditions, when given: temperature and gauge pressure go
// together; the atmospheric pressure only refines them.
function gasLine(item: ItemOf<"gas_volume">): LineConditions | undefined {
  const t = item.gas_temp_c;
  const p = item.gas_pressure_mbar_g;
  if (t === undefined && p === undefined) {
    if (item.atmospheric_pressure_mbar !== undefined) {
      throw new PhysicsInputError(
        "needs gas_temp_c and gas_pressure_mbar_g as well",
        "atmospheric_pressure_mbar",
      );
    }
    return undefined;
  }
  if (t === undefined || p === undefined) {
    const [missing, given] =
      t === undefined
        ? ["gas_temp_c", "gas_pressure_mbar_g"]
        : ["gas_pressure_mbar_g", "gas_temp_c"];
    throw new PhysicsInputError(`is required with ${given}`, missing);
  }
  return {
    gasTempC: t,
    gasPressureMbarG: p,
    atmosphericPressureMbar: item.atmospheric_pressure_mbar,
  };
}

function evaluateGasVolume(item: ItemOf<"gas_volume">): EvaluateResult {
  durationSeconds(item);
  const volumeField = oneOf(item, "volume_m3", "volume_ft3");
  const volumeM3 =
    volumeField === "volume_m3"
      ? item.volume_m3!
      : item.volume_ft3! * CUBIC_METRES_PER_CUBIC_FOOT;
  let r;
  try {
    r = gasVolumeEnergy({
      volumeM3,
      calorificValueMjM3: item.calorific_value_mj_m3,
      correctionFactor: item.correction_factor,
      line: gasLine(item),
    });
  } catch (e) {
    if (e instanceof PhysicsError)
      return physicsFailure(e, { volumeM3: volumeField });
    throw e;
  }
  const scale = [volumeField, "calorific_value_mj_m3", "correction_factor"];
  return success(item, scale, r.energyKwh, "ideal-gas/gas-volume", {
    volume_m3: volumeM3,
    correction_factor: r.correctionFactor,
    volume_at_reference_m3: r.volumeAtReferenceM3,
    calorific_value_mj_m3: item.calorific_value_mj_m3,
    cv_basis: item.cv_basis ?? "gross",
  });
}

function stockOf(item: ItemOf<"liquid_fuel">): StockBalance | undefined {
  const fields = [
    "opening_stock_l",
    "deliveries_l",
    "closing_stock_l",
  ] as const;
  const given = fields.filter((f) => item[f] !== undefined);
  if (given.length === 0) return undefined;
  const missing = fields.find((f) => item[f] === undefined);
  if (missing !== undefined) {
    throw new PhysicsInputError(
      "is required with the other stock fields (opening_stock_l, " +
        "deliveries_l, closing_stock_l)",
      missing,
    );
  }
  return {
    openingStockL: item.opening_stock_l!,
    deliveriesL: item.deliveries_l!,
    closingStockL: item.closing_stock_l!,
  };
}

function evaluateLiquidFuel(item: ItemOf<"liquid_fuel">): EvaluateResult {
  durationSeconds(item);
  const stock = stockOf(item);
  const r = liquidFuelEnergy({
    volumeL: item.volume_l,
    stock,
    densityKgL: item.density_kg_l,
    calorificValueMjKg: item.calorific_value_mj_kg,
  });
  const scale = [
    "volume_l",
    "opening_stock_l",
    "deliveries_l",
    "calorific_value_mj_kg",
  ];
  return success(item, scale, r.energyKwh, "declared-cv/liquid-fuel", {
    consumption_from: stock === undefined ? "volume" : "stock_balance",
    volume_l: r.volumeL,
    mass_kg: r.massKg,
    density_kg_l: item.density_kg_l,
    calorific_value_mj_kg: item.calorific_value_mj_kg,
    cv_basis: item.cv_basis ?? "gross",
  });
}

function evaluateSolidFuel(item: ItemOf<"solid_fuel">): EvaluateResult {
  durationSeconds(item);
  const cvMoistureBasis = item.cv_moisture_basis ?? "as_received";
  const cvBasis = item.cv_basis ?? "gross";
  const r = solidFuelEnergy({
    massKg: item.mass_kg,
    calorificValueMjKg: item.calorific_value_mj_kg,
    cvBasis,
    cvMoistureBasis,
    moisturePercent: item.moisture_percent,
  });
  const scale = ["mass_kg", "calorific_value_mj_kg"];
  return success(item, scale, r.energyKwh, "declared-cv/solid-fuel", {
    mass_kg: item.mass_kg,
    calorific_value_mj_kg: item.calorific_value_mj_kg,
    cv_basis: cvBasis,
    cv_moisture_basis: cvMoistureBasis,
    moisture_percent: item.moisture_percent ?? null,
    as_received_cv_mj_kg: r.asReceivedCvMjKg,
    dry_mass_kg: r.dryMassKg,
  });
}

function evaluateHydrogen(item: ItemOf<"hydrogen">): EvaluateResult {
  durationSeconds(item);
  const r = hydrogenEnergy({
    massKg: item.mass_kg,
    volumeNm3: item.volume_nm3,
    basis: item.basis ?? "gross",
  });
  return success(
    item,
    ["mass_kg", "volume_nm3"],
    r.energyKwh,
    "codata/hydrogen",
    {
      basis: item.basis ?? "gross",
      amount_mol: r.moles,
      mass_kg: r.massKg,
      heating_value_kj_per_mol: r.heatingValueKjMol,
      gibbs_energy_kj_per_mol: r.gibbsEnergyKjMol,
      max_work_kwh: r.maxWorkKwh,
    },
  );
}

function evaluateSteamHeat(item: ItemOf<"steam_heat">): EvaluateResult {
  durationSeconds(item);
  const r = steamHeat({
    massKg: item.mass_kg,
    pressureBarAbs: item.pressure_bar_abs,
    pressureBarG: item.pressure_bar_g,
    saturationTempC: item.saturation_temp_c,
    condensateTempC: item.condensate_temp_c,
  });
  return successKj(
    item,
    ["mass_kg"],
    r.energyKj,
    "iapws-if97/steam-condensing",
    {
      pressure_bar_abs: r.pressureBarAbs,
      saturation_temp_c: r.saturationTempC,
      h_g_kj_per_kg: r.vapourEnthalpyKjPerKg,
      h_f_kj_per_kg: r.liquidEnthalpyKjPerKg,
      h_fg_kj_per_kg: r.latentHeatKjPerKg,
      condensate_enthalpy_kj_per_kg: r.condensateEnthalpyKjPerKg,
      condensate: r.condensate,
    },
  );
}

function evaluateSensibleHeat(item: ItemOf<"sensible_heat">): EvaluateResult {
  durationSeconds(item);
  const kj = sensibleHeatKj({
    massKg: item.mass_kg,
    specificHeatKjPerKgK: item.specific_heat_kj_per_kg_k,
    inletTempC: item.inlet_temp_c,
    outletTempC: item.outlet_temp_c,
  });
  const scale = [
    "mass_kg",
    "specific_heat_kj_per_kg_k",
    "inlet_temp_c",
    "outlet_temp_c",
  ];
  return successKj(item, scale, kj, "declared-cp/sensible-heat", {
    mass_kg: item.mass_kg,
    specific_heat_kj_per_kg_k: item.specific_heat_kj_per_kg_k,
    delta_t_k: item.inlet_temp_c - item.outlet_temp_c,
  });
}

function evaluateElectricWork(item: ItemOf<"electric_work">): EvaluateResult {
  const seconds = durationSeconds(item);
  if (seconds === undefined) {
    throw new PhysicsInputError("is required (or start and end)", "seconds");
  }
  const r = electricWork({
    circuit: item.circuit,
    volts: item.volts,
    amps: item.amps,
    seconds,
    powerFactor: item.power_factor,
    voltageBasis: item.voltage_basis,
  });
  const basis =
    item.circuit === "three_phase"
      ? (item.voltage_basis ?? "line_to_line")
      : null;
  if (!Number.isFinite(r.energyJ))
    return overflow(item, ["volts", "amps", "seconds"]);
  return success(
    item,
    ["volts", "amps", "seconds"],
    convertEnergy(r.energyJ, "J", "kWh"),
    `electric/${item.circuit.replace("_", "-")}`,
    {
      active_power_w: r.activePowerW,
      seconds,
      power_factor: r.powerFactor,
      voltage_basis: basis,
    },
  );
}

function evaluateRegister(
  item: ItemOf<"electric_register" | "heat_register">,
): EvaluateResult {
  durationSeconds(item);
  const r = differenceRegister({
    startKwh: item.register_start_kwh,
    endKwh: item.register_end_kwh,
    multiplier: item.multiplier,
    capacityKwh: item.register_capacity_kwh,
  });
  if (!r.ok) return fail(`register_end_kwh: ${r.kind}: ${r.reason}`);
  const scale = ["multiplier", "register_end_kwh", "register_start_kwh"];
  return success(item, scale, r.energyKwh, "register/difference", {
    register_kind: r.kind,
    register_delta_kwh: r.registerDeltaKwh,
    multiplier: r.multiplier,
  });
}

function evaluateParsed(item: EvaluateItem): EvaluateResult {
  switch (item.quantity) {
    case "water_heat":
      return evaluateWaterHeat(item);
    case "steam_heat":
      return evaluateSteamHeat(item);
    case "sensible_heat":
      return evaluateSensibleHeat(item);
    case "electric_work":
      return evaluateElectricWork(item);
    case "electric_register":
    case "heat_register":
      return evaluateRegister(item);
    case "gas_volume":
      return evaluateGasVolume(item);
    case "liquid_fuel":
      return evaluateLiquidFuel(item);
    case "hydrogen":
      return evaluateHydrogen(item);
    case "solid_fuel":
      return evaluateSolidFuel(item);
  }
}

/** Parses and evaluates one item; a bad item becomes `{ ok: false }`. */
export function evaluateItem(raw: unknown): EvaluateResult {
  const parsed = evaluateItemSchema.safeParse(raw);
  if (!parsed.success) {
    return fail(parsed.error.issues.map(issueText).join("; "));
  }
  try {
    return evaluateParsed(parsed.data);
  } catch (e) {
    // Physics and input errors become a reason; anything else is a bug and
    // must not pass for a rejected reading.
    if (e instanceof PhysicsError) return physicsFailure(e);
    throw e;
  }
}

/** One result per item, in item order; one bad item never fails the rest. */
export function evaluateItems(items: readonly unknown[]): EvaluateResult[] {
  return items.map(evaluateItem);
}
