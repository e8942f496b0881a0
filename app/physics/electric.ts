// Electrical work at the meter: from circuit quantities over a duration, or
// as the difference of two readings of a cumulative register.

import {
  PhysicsInputError,
  PhysicsRangeError,
  requireFinite,
  requireNonNegative,
  requirePositive,
} from "./errors";

export type Circuit = "dc" | "single_phase" | "three_phase";
export type VoltageBasis = "line_to_line" | "line_to_neutral";

export interface ElectricWorkInput {
  circuit: Circuit;
  /** RMS volts for AC; line-to-line unless voltageBasis says otherwise. */
  volts: number;
  /** RMS amps for AC (per line for three-phase). */
  amps: number;
  seconds: number;
  /** cos φ, 0 < pf ≤ 1; AC only, default 1. */
  powerFactor?: number;
  /** Three-phase only; default line_to_line. */
  voltageBasis?: VoltageBasis;
}

export interface ElectricWorkResult {
  energyJ: number;
  activePowerW: number;
  powerFactor: number | null;
}

// Magnitudes only: the direction of the flow (import or export) belongs to
// the meter's orientation on the site boundary, not to these numbers.
function requireAcOptions(input: ElectricWorkInput): number {
  if (input.circuit === "dc") {
    if (input.powerFactor !== undefined) {
      throw new PhysicsInputError("applies to AC circuits only", "powerFactor");
    }
  }
  if (input.circuit !== "three_phase" && input.voltageBasis !== undefined) {
    throw new PhysicsInputError(
      "applies to three-phase circuits only",
      "voltageBasis",
    );
  }
  const pf = input.powerFactor ?? 1;
  requireFinite("powerFactor", pf);
  if (pf <= 0 || pf > 1) {
    throw new PhysicsRangeError(
      `${pf} is outside 0 < power factor ≤ 1`,
      "powerFactor",
    );
  }
  return pf;
}

// Balanced three-phase: P = √3·V_LL·I·cos φ = 3·V_LN·I·cos φ (textbook,
// common practice); single-phase P = V·I·cos φ; DC P = V·I.
function activePowerW(input: ElectricWorkInput, pf: number): number {
  const vi = input.volts * input.amps;
  if (input.circuit === "dc") return vi;
  if (input.circuit === "single_phase") return vi * pf;
  const lineToNeutral = input.voltageBasis === "line_to_neutral";
  return (lineToNeutral ? 3 : Math.sqrt(3)) * vi * pf;
}

export function electricWork(input: ElectricWorkInput): ElectricWorkResult {
  requireNonNegative("volts", input.volts);
  requireNonNegative("amps", input.amps);
  requireNonNegative("seconds", input.seconds);
  const pf = requireAcOptions(input);
  const power = activePowerW(input, pf);
  return {
    energyJ: power * input.seconds,
    activePowerW: power,
    powerFactor: input.circuit === "dc" ? null : pf,
  };
}

/**
 * Roll-over rule: when the end reading is below the start reading and the
 * register's roll-over point (capacity) is known, the drop is read as one
 * wrap past the capacity only when the wrapped advance
 * capacity − start + end is less than ROLLOVER_MAX_FRACTION of the capacity.
 * A register that wraps more than once between two reads, or advances by
 * half its span, cannot be told apart from a swap, so the reading is
 * flagged rather than guessed (the same half-span rule as serial-number
 * arithmetic).
 */
export const ROLLOVER_MAX_FRACTION = 0.5;

export interface RegisterDifferenceInput {
  startKwh: number;
  endKwh: number;
  /** CT/VT ratio or meter constant; multiplies the register difference. */
  multiplier?: number;
  /** The value at which the register wraps to zero (e.g. 100000). */
  capacityKwh?: number;
}

export type RegisterDifference =
  | {
      ok: true;
      kind: "advance" | "rollover";
      registerDeltaKwh: number;
      multiplier: number;
      energyKwh: number;
    }
  | { ok: false; kind: "register_drop"; reason: string };

function requireRegisterValues(input: RegisterDifferenceInput): void {
  requireNonNegative("startKwh", input.startKwh);
  requireNonNegative("endKwh", input.endKwh);
  requirePositive("multiplier", input.multiplier ?? 1);
  if (input.capacityKwh === undefined) return;
  const cap = requirePositive("capacityKwh", input.capacityKwh);
  for (const field of ["startKwh", "endKwh"] as const) {
    if (input[field] >= cap) {
      throw new PhysicsRangeError(
        `${input[field]} kWh is not below the roll-over point ${cap} kWh; ` +
          `a register shows 0 kWh to just under its capacity`,
        field,
      );
    }
  }
}

function dropReason(input: RegisterDifferenceInput): string {
  const { startKwh: s, endKwh: e, capacityKwh: cap } = input;
  const base = `register fell from ${s} kWh to ${e} kWh`;
  if (cap === undefined) {
    return `${base} and no roll-over point is known: meter swap, reset or fault`;
  }
  return (
    `${base}; a roll-over at ${cap} kWh would mean an advance of ` +
    `${cap - s + e} kWh, not less than ${ROLLOVER_MAX_FRACTION} of the ` +
    `register span, so it is treated as a meter swap, reset or fault`
  );
}

/** Energy between two reads of a cumulative register, never silently < 0. */
export function differenceRegister(
  input: RegisterDifferenceInput,
): RegisterDifference {
  requireRegisterValues(input);
  const multiplier = input.multiplier ?? 1;
  const { startKwh: s, endKwh: e, capacityKwh: cap } = input;
  if (e >= s) {
    const d = e - s;
    return {
      ok: true,
      kind: "advance",
      registerDeltaKwh: d,
      multiplier,
      energyKwh: d * multiplier,
    };
  }
  if (cap !== undefined && cap - s + e < ROLLOVER_MAX_FRACTION * cap) {
    const d = cap - s + e;
    return {
      ok: true,
      kind: "rollover",
      registerDeltaKwh: d,
      multiplier,
      energyKwh: d * multiplier,
    };
  }
  return { ok: false, kind: "register_drop", reason: dropReason(input) };
}
