import { hash } from "node:crypto";
import type { GasPiece, GasMeterContext } from "~/gas/gas-intervals";
import { localDay } from "~/gas/gas-intervals";
import {
  gasRegisterError,
  priceSeriesGasReading,
  takesSeriesCv,
  withGasDefaults,
} from "~/gas/prepare-gas";
import { isStorableText } from "~/lib/storable-text";
import { readingExergyBasis, type ExergyBasis } from "~/exergy/interval-exergy";
import { evaluateItem } from "~/physics/evaluate";
import { parseReading, type ParsedReading } from "./reading-schema";
import type { IngestMeter } from "./meter-lookup.server";
import { stepMsOf } from "./hours";
import { installedError } from "./time-rules";
import {
  meterKindError,
  resolutionError,
  resolutionMinutes,
} from "./interval-energy";

/** A reading ready to store: its key, what arrived and its signed energy. */
export interface PreparedReading {
  index: number;
  meter: IngestMeter;
  readingTime: Date;
  endTime: Date | null;
  payload: Record<string, unknown>;
  payloadHash: string;
  energyKwh: string | null;
  registerKwh: number | null;
  /** ± kWh from the meter's EN 1434 MPE, where the meter's class is known. */
  uncertaintyKwh: string | null;
  /** Heat and entropy of a water_heat reading, for its exergy (app/exergy). */
  exergyBasis?: ExergyBasis | null;
  /** A natural-gas meter's supply: its CVs, register and correction (app/gas). */
  gas?: GasMeterContext;
  /** A gas reading priced by the series: its intervals' volumes and energies. */
  gasPieces?: GasPiece[];
}

export interface Rejection {
  index: number;
  meter?: string;
  reason: string;
}

/**
 * JSON with sorted keys, so the same reading in another key order is a
 * repeat. Stored hashes depend on this exact text: it must not change.
 */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) {
    let out = "[";
    for (let i = 0; i < value.length; i++) {
      // As Array#join: an element with no JSON text adds nothing.
      out += (i ? "," : "") + (canonicalJson(value[i]) ?? "");
    }
    return out + "]";
  }
  if (value && typeof value === "object") {
    const object = value as Record<string, unknown>;
    const keys = Object.keys(object).sort();
    let out = "{";
    for (let i = 0; i < keys.length; i++) {
      out += `${i ? "," : ""}${JSON.stringify(keys[i])}:${canonicalJson(object[keys[i]])}`;
    }
    return out + "}";
  }
  return JSON.stringify(value);
}

export function hashPayload(payload: unknown): string {
  return hash("sha256", canonicalJson(payload));
}

/**
 * The sign that turns what a meter measures into energy into the site
 * (design.md). Export meters measure what leaves the site: the sign flips.
 * A cooling meter's register counts the cooling it delivered, a magnitude,
 * while that cooling is heat leaving the site: its hours are negative, as
 * chilled water measured by flow and return comes out by itself. An
 * `interval_energy` reading is such a magnitude too, on any meter.
 */
export function siteSign(
  meter: Pick<IngestMeter, "orientation" | "carrier" | "quantity">,
  readingQuantity: string = meter.quantity,
): 1 | -1 {
  const orientation = meter.orientation === "export" ? -1 : 1;
  const magnitude =
    readingQuantity === "heat_register" ||
    readingQuantity === "interval_energy";
  const coolingDelivered = meter.carrier === "cooling" && magnitude;
  return coolingDelivered ? (-orientation as 1 | -1) : orientation;
}

/**
 * The meter's configured sensor position and pressure fill what a reading
 * leaves out. The item is the parser's own copy of the reading (never the
 * stored payload), so it is completed in place.
 */
function withMeterDefaults(
  filled: Record<string, unknown>,
  meter: IngestMeter,
) {
  if (
    filled.quantity === "water_heat" &&
    filled.sensor_at === undefined &&
    meter.sensorAt
  ) {
    filled.sensor_at = meter.sensorAt;
  }
  const hasPressure =
    filled.pressure_bar_abs !== undefined ||
    filled.pressure_bar_g !== undefined ||
    filled.saturation_temp_c !== undefined;
  const needsPressure =
    filled.quantity === "water_heat" || filled.quantity === "steam_heat";
  if (needsPressure && !hasPressure && meter.defaultPressureBarAbs !== null) {
    filled.pressure_bar_abs = Number(meter.defaultPressureBarAbs);
  }
  // The meter's EN 1434 rating gives each reading its MPE band.
  const rated =
    meter.accuracyClass !== null &&
    meter.deltaThetaMinK !== null &&
    meter.qpM3PerH !== null;
  if (
    filled.quantity === "water_heat" &&
    rated &&
    filled.meter_class === undefined
  ) {
    filled.meter_class = meter.accuracyClass;
    filled.delta_theta_min_k = Number(meter.deltaThetaMinK);
    filled.qp_m3_per_h = Number(meter.qpM3PerH);
  }
  return filled;
}

function prepareOne(
  index: number,
  raw: unknown,
  reading: ParsedReading,
  meter: IngestMeter,
  gas: GasMeterContext | undefined,
): PreparedReading | Rejection {
  if (reading.kind === "gas_register")
    return prepareGasRegister(index, raw, reading, meter, gas);
  if (gas?.settings.registerUnit)
    return {
      index,
      meter: meter.code,
      reason: `quantity: meter ${meter.code} reads a gas register; send gas_register reads`,
    };
  if (reading.kind === "interval_energy")
    return prepareIntervalEnergy(index, raw, reading, meter);
  const at = reading.kind === "interval" ? reading.start : reading.time;
  if (reading.quantity !== meter.quantity) {
    return {
      index,
      meter: meter.code,
      reason: `quantity: meter ${meter.code} measures ${meter.quantity}`,
    };
  }
  const notInstalled = installedError(meter, at);
  if (notInstalled) return { index, meter: meter.code, reason: notInstalled };
  const payload = raw as Record<string, unknown>;
  const payloadHash = hashPayload(payload);
  if (reading.kind === "register") {
    return {
      index,
      meter,
      payload,
      payloadHash,
      readingTime: reading.time,
      endTime: null,
      energyKwh: null,
      registerKwh: reading.registerKwh,
      uncertaintyKwh: null,
    };
  }
  const item = withMeterDefaults(reading.item, meter);
  if (gas) withGasDefaults(item, gas.settings);
  if (gas && takesSeriesCv(item))
    return prepareSeriesGas(index, payload, payloadHash, reading, meter, gas);
  const result = evaluateItem(item);
  if (!result.ok) return { index, meter: meter.code, reason: result.error };
  const sign = siteSign(meter);
  const signed = result.energy_kwh * sign;
  const mpePercent = result.details.en1434_mpe_percent;
  return {
    index,
    meter,
    payload,
    payloadHash,
    readingTime: reading.start,
    endTime: reading.end,
    energyKwh: signed.toFixed(6),
    registerKwh: null,
    uncertaintyKwh:
      typeof mpePercent === "number"
        ? ((Math.abs(result.energy_kwh) * mpePercent) / 100).toFixed(6)
        : null,
    exergyBasis: readingExergyBasis(item, result.details, sign),
  };
}

/** A gas_volume reading without its own CV: each interval at its day's CV. */
function prepareSeriesGas(
  index: number,
  payload: Record<string, unknown>,
  payloadHash: string,
  reading: Extract<ParsedReading, { kind: "interval" }>,
  meter: IngestMeter,
  gas: GasMeterContext,
): PreparedReading | Rejection {
  const priced = priceSeriesGasReading({
    item: reading.item,
    meterCode: meter.code,
    start: reading.start,
    end: reading.end,
    stepMs: stepMsOf(meter),
    context: gas,
  });
  if (!priced.ok) return { index, meter: meter.code, reason: priced.reason };
  const sign = siteSign(meter);
  return {
    index,
    meter,
    payload,
    payloadHash,
    readingTime: reading.start,
    endTime: reading.end,
    energyKwh: (priced.energyKwh * sign + 0).toFixed(6),
    registerKwh: null,
    uncertaintyKwh: null,
    gas,
    gasPieces: priced.pieces.map((p) => ({
      ...p,
      energyKwh: p.energyKwh * sign + 0,
    })),
  };
}

/**
 * A gas register read: stored as the register's value in its own unit
 * (raw_readings.register_kwh holds it); its intervals are recomputed from
 * the reads around it with the supply's CVs (register-hours.server.ts).
 */
function prepareGasRegister(
  index: number,
  raw: unknown,
  reading: Extract<ParsedReading, { kind: "gas_register" }>,
  meter: IngestMeter,
  gas: GasMeterContext | undefined,
): PreparedReading | Rejection {
  const refusal =
    gasRegisterError({
      meterCode: meter.code,
      meterQuantity: meter.quantity,
      context: gas,
      unit: reading.unit,
      register: reading.register,
      time: reading.time,
      rollover: meter.rolloverKwh === null ? null : Number(meter.rolloverKwh),
      dayHasCv:
        gas !== undefined &&
        gas.lookup(localDay(reading.time, gas.timeZone)) !== null,
    }) ?? installedError(meter, reading.time);
  if (refusal) return { index, meter: meter.code, reason: refusal };
  const payload = raw as Record<string, unknown>;
  return {
    index,
    meter,
    payload,
    payloadHash: hashPayload(payload),
    readingTime: reading.time,
    endTime: null,
    energyKwh: null,
    registerKwh: reading.register,
    uncertaintyKwh: null,
    gas,
  };
}

/**
 * The kWh of one of the meter's intervals. Any interval meter takes it
 * whatever it measures (a supplier's kWh is as good as the meter's own
 * readings); register meters do not (interval-energy.ts).
 */
function prepareIntervalEnergy(
  index: number,
  raw: unknown,
  reading: Extract<ParsedReading, { kind: "interval_energy" }>,
  meter: IngestMeter,
): PreparedReading | Rejection {
  const refusal =
    meterKindError(meter) ??
    resolutionError(resolutionMinutes(meter), reading.start, reading.end) ??
    installedError(meter, reading.start);
  if (refusal) return { index, meter: meter.code, reason: refusal };
  const payload = raw as Record<string, unknown>;
  const signed = reading.energyKwh * siteSign(meter, reading.quantity);
  return {
    index,
    meter,
    payload,
    payloadHash: hashPayload(payload),
    readingTime: reading.start,
    endTime: reading.end,
    // + 0 turns an export meter's −0 into 0.
    energyKwh: (signed + 0).toFixed(6),
    registerKwh: null,
    uncertaintyKwh: null,
  };
}

/**
 * Checks every reading on its own and computes interval energies; a bad
 * reading is rejected with its index and a plain reason, never failing others.
 */
export function prepareReadings(
  raws: readonly unknown[],
  metersByCode: Map<string, IngestMeter>,
  now = new Date(),
  gasContexts: ReadonlyMap<string, GasMeterContext> = new Map(),
): { prepared: PreparedReading[]; rejected: Rejection[] } {
  const prepared: PreparedReading[] = [];
  const rejected: Rejection[] = [];
  raws.forEach((raw, index) => {
    const parsed = parseReading(raw, now);
    if (!parsed.ok) {
      const code = (raw as { meter?: unknown } | null)?.meter;
      return void rejected.push({
        index,
        reason: parsed.error,
        ...(typeof code === "string" ? { meter: code } : {}),
      });
    }
    const meter = metersByCode.get(parsed.reading.meter);
    if (!meter) {
      return void rejected.push({
        index,
        meter: parsed.reading.meter,
        reason: `meter: no meter ${parsed.reading.meter} in this organisation`,
      });
    }
    const outcome = prepareOne(
      index,
      raw,
      parsed.reading,
      meter,
      gasContexts.get(meter.id),
    );
    if ("reason" in outcome) rejected.push(outcome);
    else prepared.push(outcome);
  });
  return { prepared, rejected };
}

export function codesIn(raws: readonly unknown[]): string[] {
  const codes = new Set<string>();
  for (const raw of raws) {
    const code = (raw as { meter?: unknown } | null)?.meter;
    // A code PostgreSQL cannot hold would fail the lookup of every code;
    // its reading is refused by the schema instead.
    if (typeof code === "string" && code.trim() && isStorableText(code))
      codes.add(code.trim());
  }
  return [...codes];
}
