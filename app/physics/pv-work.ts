// Pressure-volume work against a constant external pressure, IUPAC sign
// convention (work done on the system is positive): W = −p_ext · ΔV.
// Compression (ΔV < 0) gives positive work; expansion gives negative work.

import { requireFinite, requireNonNegative } from "./errors";

export function pressureVolumeWorkJ(
  externalPressurePa: number,
  volumeChangeM3: number,
): number {
  requireNonNegative("externalPressurePa", externalPressurePa);
  requireFinite("volumeChangeM3", volumeChangeM3);
  // 0 − x keeps a zero change from coming out as −0.
  return 0 - externalPressurePa * volumeChangeM3;
}
