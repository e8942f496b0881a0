// Shared helpers for the scenario tests: the gateway readings turned into
// the items POST /api/v1/energy/evaluate takes (design.md: readings without
// `meter`; registers as pairs of consecutive reads).

import { localDay } from "../../../app/gas/gas-intervals";
import { demoCalorificValue } from "../../../seeds/scenario/gas-supplies";
import type {
  GasRegisterReading,
  GatewayReading,
  RegisterReading,
} from "../../../seeds/scenario/generate";
import type { ScenarioMeter } from "../../../seeds/scenario/larchmere-estate";

/**
 * The reading as an evaluate item. A gas reading without a CV gets its
 * supply's CV for the site-local day (the demo's series), as ingest gives
 * it one (app/gas).
 */
export function withoutMeter(r: GatewayReading): Record<string, unknown> {
  const { meter: _meter, ...item } = r;
  if (r.quantity === "gas_volume" && !("calorific_value_mj_m3" in item)) {
    const day = localDay(new Date(r.start), "Europe/London");
    return {
      ...item,
      calorific_value_mj_m3: demoCalorificValue(day.slice(0, 7)),
    };
  }
  return item;
}

export function isRegister(r: GatewayReading): r is RegisterReading {
  return r.quantity === "electric_register";
}

/** A read of a register, electric or gas: an instant, not an interval. */
export function isAnyRegister(
  r: GatewayReading,
): r is RegisterReading | GasRegisterReading {
  return r.quantity === "electric_register" || r.quantity === "gas_register";
}

/** One evaluate item per pair of consecutive reads of one register meter. */
export function registerItems(
  meter: ScenarioMeter,
  reads: readonly RegisterReading[],
): Record<string, unknown>[] {
  const out: Record<string, unknown>[] = [];
  for (let i = 1; i < reads.length; i++) {
    out.push({
      quantity: "electric_register",
      start: reads[i - 1].time,
      end: reads[i].time,
      register_start_kwh: reads[i - 1].register_kwh,
      register_end_kwh: reads[i].register_kwh,
      multiplier: meter.multiplier,
      ...(meter.rolloverKwh === undefined
        ? {}
        : { register_capacity_kwh: meter.rolloverKwh }),
    });
  }
  return out;
}

/** Evaluate items of one meter's readings, whatever its quantity. */
export function itemsOf(
  meter: ScenarioMeter,
  readings: readonly GatewayReading[],
): Record<string, unknown>[] {
  if (meter.quantity === "electric_register") {
    return registerItems(meter, readings.filter(isRegister));
  }
  return readings.map(withoutMeter);
}

/** Coefficient of determination of a straight-line fit of y on x. */
export function rSquared(xs: readonly number[], ys: readonly number[]) {
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    sxy += (xs[i] - mx) * (ys[i] - my);
    sxx += (xs[i] - mx) ** 2;
    syy += (ys[i] - my) ** 2;
  }
  return (sxy * sxy) / (sxx * syy);
}
