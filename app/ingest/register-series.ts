// Per-step energies from a meter's cumulative register reads. A register
// value is a state of the meter; the energy of a step is the difference of
// two states, so the differencing itself is the physics module's (with its
// multiplier and roll-over rule) and this module only walks the series.

import { differenceRegister } from "../physics/electric";

export interface RegisterRead {
  time: Date;
  registerKwh: number;
}

export type RegisterFlag = null | "rollover" | "register_drop";

export interface RegisterDelta {
  from: Date;
  to: Date;
  energyKwh: number;
  flag: RegisterFlag;
}

export interface RegisterSeriesOptions {
  /** CT/VT ratio or meter constant; default 1. */
  multiplier?: number;
  /** The value at which the register wraps to zero, if known. */
  capacityKwh?: number;
}

function requireIncreasingTimes(reads: readonly RegisterRead[]): void {
  for (let i = 1; i < reads.length; i++) {
    if (reads[i].time.getTime() <= reads[i - 1].time.getTime()) {
      throw new RangeError(
        `register reads must be in strictly increasing time order; read ${i} ` +
          `at ${reads[i].time.toISOString()} is not after read ${i - 1}`,
      );
    }
  }
}

/**
 * One delta per pair of consecutive reads. A drop that is a roll-over counts
 * the wrapped advance and is flagged "rollover"; any other drop (meter swap,
 * reset, fault) is flagged "register_drop" with energy 0, so a fault can
 * never enter the ledger as negative energy. A read outside the register's
 * range (negative, or not below the roll-over point) throws the physics
 * module's PhysicsRangeError: such a read should have been rejected on
 * arrival.
 */
export function registerDeltas(
  reads: readonly RegisterRead[],
  options: RegisterSeriesOptions = {},
): RegisterDelta[] {
  requireIncreasingTimes(reads);
  const out: RegisterDelta[] = [];
  for (let i = 1; i < reads.length; i++) {
    const a = reads[i - 1];
    const b = reads[i];
    const d = differenceRegister({
      startKwh: a.registerKwh,
      endKwh: b.registerKwh,
      multiplier: options.multiplier,
      capacityKwh: options.capacityKwh,
    });
    out.push({
      from: a.time,
      to: b.time,
      energyKwh: d.ok ? d.energyKwh : 0,
      flag: d.kind === "advance" ? null : d.kind,
    });
  }
  return out;
}
