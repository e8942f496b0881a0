import { describe, expect, it } from "vitest";
import {
  carrierColour,
  carrierColours,
  carrierExportColour,
} from "./carrier-colours";
import type { Carrier } from "./meter-kinds";

const carriers = Object.keys(carrierColours) as Carrier[];

describe("exported energy's chart colour", () => {
  it("is the carrier's colour mixed 55 % with white", () => {
    // #a9501f: 169 + 0.55 × 86 = 216 (d8), 80 + 0.55 × 175 = 176 (b0),
    // 31 + 0.55 × 224 = 154 (9a), each rounded.
    expect(carrierExportColour("heat")).toBe("#d8b09a");
  });

  it("differs from every delivered colour, so a legend tells them apart", () => {
    const delivered = new Set(carriers.map(carrierColour));
    for (const carrier of carriers)
      expect(delivered.has(carrierExportColour(carrier))).toBe(false);
  });
});
