// Shared assertion for the physics tests: relative agreement, which is how
// the IF97 release states its verification tolerance.

import { expect } from "vitest";

export function expectRelativeClose(
  actual: number,
  expected: number,
  relativeTolerance: number,
): void {
  const relative = Math.abs(actual - expected) / Math.abs(expected);
  expect(
    relative,
    `got ${actual}, expected ${expected} (relative ${relative})`,
  ).toBeLessThanOrEqual(relativeTolerance);
}
