/** Axis arithmetic for the charts: readable units and round tick steps. Pure. */

export interface EnergyScale {
  unit: "kWh" | "MWh";
  /** Divide kWh by this to get the unit. */
  divisor: number;
}

/** MWh once figures reach ten thousand kWh, so labels stay short. */
export function energyScale(maxAbsKwh: number): EnergyScale {
  return maxAbsKwh >= 10_000
    ? { unit: "MWh", divisor: 1000 }
    : { unit: "kWh", divisor: 1 };
}

/** 1, 2, 2.5 or 5 × 10ⁿ: the step nearest to span ÷ target ticks. */
export function niceStep(span: number, targetTicks = 5): number {
  if (!(span > 0)) return 1;
  const raw = span / targetTicks;
  const power = 10 ** Math.floor(Math.log10(raw));
  const fraction = raw / power;
  const nice =
    fraction <= 1
      ? 1
      : fraction <= 2
        ? 2
        : fraction <= 2.5
          ? 2.5
          : fraction <= 5
            ? 5
            : 10;
  return nice * power;
}

export interface Axis {
  min: number;
  max: number;
  step: number;
  ticks: number[];
}

/** An axis from round numbers that holds every value and zero. */
export function axisFor(values: readonly number[]): Axis {
  const lo = Math.min(0, ...values);
  const hi = Math.max(0, ...values);
  const step = niceStep(hi - lo || 1);
  const min = Math.floor(lo / step) * step;
  const max = Math.max(Math.ceil(hi / step) * step, min + step);
  const ticks: number[] = [];
  for (let t = min; t <= max + step / 2; t += step)
    ticks.push(Number(t.toPrecision(12)));
  return { min, max, step, ticks };
}

/** A tick label with thousands separators and at most the step's decimals. */
export function tickLabel(value: number, step: number): string {
  const decimals = Math.min(
    3,
    (String(Number(step.toPrecision(6))).split(".")[1] ?? "").length,
  );
  const text = Math.abs(value).toFixed(decimals);
  const [whole, fraction] = text.split(".");
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  const sign = value < 0 && Number(text) !== 0 ? "\u2212" : "";
  return `${sign}${grouped}${fraction ? `.${fraction}` : ""}`;
}
