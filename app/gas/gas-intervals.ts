/**
 * Gas volumes → interval energies with the supply's calorific values. A
 * volume at reference conditions is split over the meter's intervals by
 * time (as every reading is), and each piece takes the CV in effect on its
 * interval's site-local day, so a reading across midnight on the day a CV
 * changes gives each side its own CV. Pure; the ingest path calls it.
 */
import { splitAcrossIntervals } from "../ingest/hours";
import { localParts } from "../ingest/local-time";
import { gasCorrectionFactor } from "../physics/gas-volume";
import {
  cubicMetresPerUnit,
  type CvLookup,
  type GasRegisterUnit,
} from "./calorific-values";

/** A gas meter's own settings (gas_meter_settings), numbers parsed. */
export interface GasSettings {
  registerUnit: GasRegisterUnit | null;
  correctionFactor: number | null;
  gasTempC: number | null;
  gasPressureMbarG: number | null;
  atmosphericPressureMbar: number | null;
}

export const NO_GAS_SETTINGS: GasSettings = {
  registerUnit: null,
  correctionFactor: null,
  gasTempC: null,
  gasPressureMbarG: null,
  atmosphericPressureMbar: null,
};

/** What ingest knows of one gas meter's supply for a batch. */
export interface GasMeterContext {
  timeZone: string;
  settings: GasSettings;
  lookup: CvLookup;
}

/** The site-local calendar day of an instant, YYYY-MM-DD. */
export function localDay(at: Date, timeZone: string): string {
  const p = localParts(at, timeZone);
  return `${p.year}-${String(p.month).padStart(2, "0")}-${String(p.day).padStart(2, "0")}`;
}

/**
 * The meter's volume correction to 15 °C and 1013.25 mbar: its stated
 * factor, else its gas temperature and gauge pressure (ideal gas), else 1
 * (volumes already at reference conditions).
 */
export function settingsCorrection(s: GasSettings): number {
  if (s.correctionFactor !== null) return s.correctionFactor;
  if (s.gasTempC !== null && s.gasPressureMbarG !== null)
    return gasCorrectionFactor(
      s.gasTempC,
      s.gasPressureMbarG,
      s.atmosphericPressureMbar ?? undefined,
    );
  return 1;
}

/** One interval's share of a gas volume and the energy its CV gives. */
export interface GasPiece {
  /** Start of the meter's UTC interval, ms. */
  start: number;
  volumeM3: number;
  /** Null: no CV in effect on the interval's day yet (pending). */
  cvMjM3: number | null;
  energyKwh: number;
}

/** kWh of a volume at reference conditions: V × CV / 3.6 (1 kWh = 3.6 MJ). */
export function gasEnergyKwh(volumeM3: number, cvMjM3: number): number {
  return (volumeM3 * cvMjM3) / 3.6;
}

/** The CV-less part of a piece: each interval's volume and its day. */
export function volumePieces(
  start: Date,
  end: Date,
  volumeM3: number,
  stepMs: number,
): { start: number; volumeM3: number }[] {
  return splitAcrossIntervals(start, end, volumeM3, stepMs).map((p) => ({
    start: p.intervalStart.getTime(),
    volumeM3: p.energyKwh,
  }));
}

/** Each piece's energy from the CV of its interval's site-local day. */
export function priceByDay(
  pieces: readonly { start: number; volumeM3: number }[],
  context: Pick<GasMeterContext, "timeZone" | "lookup">,
): GasPiece[] {
  return pieces.map((p) => {
    const cv = context.lookup(localDay(new Date(p.start), context.timeZone));
    return {
      start: p.start,
      volumeM3: p.volumeM3,
      cvMjM3: cv?.cvMjM3 ?? null,
      energyKwh: cv ? gasEnergyKwh(p.volumeM3, cv.cvMjM3) : 0,
    };
  });
}

/** The days of a span's intervals that have no CV, in order (for a refusal). */
export function daysWithoutCv(pieces: readonly GasPiece[], timeZone: string) {
  const days = new Set<string>();
  for (const p of pieces)
    if (p.cvMjM3 === null) days.add(localDay(new Date(p.start), timeZone));
  return [...days];
}

/**
 * A register advance (register units × multiplier, roll-over already
 * resolved) as cubic metres at reference conditions.
 */
export function registerVolumeM3(advance: number, settings: GasSettings) {
  const unit = settings.registerUnit ?? "m3";
  return advance * cubicMetresPerUnit(unit) * settingsCorrection(settings);
}
