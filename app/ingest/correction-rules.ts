/**
 * What a person's correction of one hour must respect besides the time rules
 * (time-rules.ts): the sign of the meter's hours, and the meter's own
 * history. A wrong sign is refused; a value the spike rule of ingest
 * (validate.ts) would flag needs a confirmation that names the jump, and is
 * then stored with the flag `confirmed_spike` (docs/ingest.md, "Rules").
 *
 * Pure: the page shows the same words the write path answers with.
 */
import { formatHourKwh, formatNumber } from "~/lib/format";
import type { IntervalPoint } from "./series";
import {
  expectedSign,
  isSpike,
  typicalIntervalValue,
  type MeterBoundary,
} from "./validate";

/** A correction far outside the meter's history that a person confirmed. */
export const CONFIRMED_SPIKE_FLAG = "confirmed_spike";

/**
 * Flags that describe an hour's value rather than the readings behind it:
 * a correction replaces the value, so they go with it. (`rollover`,
 * `register_drop` and `late_data_after_edit` stay: they are about readings.)
 */
export const VALUE_FLAGS = ["spike", "wrong_sign", CONFIRMED_SPIKE_FLAG];

export interface CorrectedMeter extends MeterBoundary {
  code: string;
  spikeFactor: number;
}

/** How far a corrected value lies from the meter's history. */
export interface Jump {
  typicalIntervalKwh: number;
  timesTypical: number;
  spikeFactor: number;
}

function direction(meter: MeterBoundary): string {
  return meter.orientation === "import"
    ? "delivered to the site"
    : "exported from the site";
}

/** What the meter's hours are, for the correction field's hint. */
export function correctionHint(meter: MeterBoundary): string {
  // The carriers' names are the trade's nouns: "Heat delivered to the site".
  const noun = meter.carrier;
  const what = `${noun[0].toUpperCase()}${noun.slice(1)} ${direction(meter)}`;
  if (expectedSign(meter) === 1)
    return `${what}: enter a positive number of kWh (or 0).`;
  const why = meter.carrier === "cooling" ? " (heat taken out)" : "";
  return `${what}, which the ledger counts as negative kWh${why}: enter −12.5 for 12.5 kWh.`;
}

/** Null when the value has the sign of the meter's hours (0 always has). */
export function wrongSignError(
  meter: CorrectedMeter,
  energyKwh: number,
): string | null {
  const sign = expectedSign(meter);
  if (energyKwh * sign >= 0) return null;
  const noun = meter.carrier;
  const counted = sign === 1 ? "positive" : "negative";
  const verb = meter.orientation === "import" ? "delivered" : "exported";
  return (
    `${meter.code} records ${noun} ${direction(meter)}, which the ledger counts as ` +
    `${counted} kWh (or 0): ${formatHourKwh(energyKwh)} kWh has the wrong sign. ` +
    `If ${formatHourKwh(Math.abs(energyKwh))} kWh was ${verb}, enter ${formatHourKwh(-energyKwh)}.`
  );
}

/**
 * The jump, when the value is a spike by ingest's rule against the meter's
 * history (the hour being corrected left out: its old value is what the
 * person is replacing). Null when it is not, or when the history has no
 * non-zero actual reading to compare with.
 */
export function spikeJump(
  meter: CorrectedMeter,
  energyKwh: number,
  history: readonly IntervalPoint[],
  intervalStart: Date,
): Jump | null {
  const others = history.filter(
    (p) => p.intervalStart.getTime() !== intervalStart.getTime(),
  );
  const typical = typicalIntervalValue(others);
  if (typical === null || !isSpike(energyKwh, typical, meter.spikeFactor))
    return null;
  return {
    typicalIntervalKwh: typical,
    timesTypical: Math.abs(energyKwh) / typical,
    spikeFactor: meter.spikeFactor,
  };
}

function formatTimes(times: number): string {
  return formatNumber(times, times < 100 ? 1 : 0);
}

/** Names the jump, for the refusal that asks for a confirmation. */
export function jumpMessage(energyKwh: number, jump: Jump): string {
  return (
    `${formatHourKwh(energyKwh)} kWh is ${formatTimes(jump.timesTypical)} × this meter's ` +
    `typical interval of ${formatHourKwh(jump.typicalIntervalKwh, 1)} kWh; intervals above ` +
    `${formatTimes(jump.spikeFactor)} × are flagged as spikes. Confirm the value to save it.`
  );
}

/** The confirmation's own words: it names the value it stands behind. */
export function confirmLabel(energyKwh: number): string {
  return `Yes, ${formatHourKwh(energyKwh)} kWh is right: save it and flag the interval as a confirmed spike`;
}
