import { describe, expect, it } from "vitest";
import {
  carrierColour,
  carrierColours,
  carrierExportColour,
} from "./carrier-colours";
import { carriers } from "./meter-kinds";

/** WCAG 2 relative luminance of a #rrggbb colour. */
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => {
    const c = parseInt(hex.slice(i, i + 2), 16) / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

function contrast(a: string, b: string): number {
  const [light, dark] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (light + 0.05) / (dark + 0.05);
}

/** CIE 1976 L*a*b* of a #rrggbb colour (sRGB, D65). */
function lab(hex: string): [number, number, number] {
  const [r, g, b] = [1, 3, 5].map((i) => {
    const c = parseInt(hex.slice(i, i + 2), 16) / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  const x = (0.4124 * r + 0.3576 * g + 0.1805 * b) / 0.95047;
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const z = (0.0193 * r + 0.1192 * g + 0.9505 * b) / 1.08883;
  const f = (t: number) => (t > 0.008856 ? Math.cbrt(t) : 7.787 * t + 16 / 116);
  return [116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))];
}

describe("carrier colours", () => {
  it("every carrier, fuels included, has one", () => {
    expect(Object.keys(carrierColours).sort()).toEqual([...carriers].sort());
  });

  it.each([...carriers])(
    "%s: chart 4.5:1 on white and on its tint, badge text 6.5:1",
    (carrier) => {
      const { chart, tint, ink } = carrierColours[carrier];
      expect(contrast(chart, "#ffffff")).toBeGreaterThanOrEqual(4.5);
      expect(contrast(chart, tint)).toBeGreaterThanOrEqual(4.5);
      expect(contrast(ink, tint)).toBeGreaterThanOrEqual(6.5);
    },
  );

  it("no two carriers' chart colours are closer than ΔE 20", () => {
    for (const a of carriers) {
      for (const b of carriers) {
        if (a >= b) continue;
        const [p, q] = [lab(carrierColour(a)), lab(carrierColour(b))];
        const distance = Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]);
        expect(distance, `${a} and ${b}`).toBeGreaterThanOrEqual(20);
      }
    }
  });
});

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
