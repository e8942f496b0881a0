import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { axisFor, energyScale, niceStep, tickLabel } from "./charts/scale";
import { fontFile, runs, subsetOf, woffToSfnt } from "./fonts.server";
import { band, factor, kwh, share, signedPercent } from "./format";
import { tokens } from "./formula";

describe("fonts", () => {
  it("sends each character to a subset that covers it", () => {
    expect(subsetOf("a")).toBe("latin");
    expect(subsetOf("\u2212")).toBe("latin");
    expect(subsetOf("ρ")).toBe("greek");
    expect(subsetOf("Ł")).toBe("latin-ext");
    expect(subsetOf("√")).toBeNull();
    expect(runs("Q = V·ρ·Δh", "regular")).toEqual([
      { face: "latin-regular", text: "Q = V·" },
      { face: "greek-regular", text: "ρ" },
      { face: "latin-regular", text: "·" },
      { face: "greek-regular", text: "Δ" },
      { face: "latin-regular", text: "h" },
    ]);
  });

  it("unwraps a WOFF into the OpenType font it holds", () => {
    const woff = readFileSync(fontFile("latin", "regular"));
    const sfnt = woffToSfnt(woff);
    const numTables = woff.readUInt16BE(12);
    expect(sfnt.subarray(0, 4)).toEqual(woff.subarray(4, 8));
    expect(sfnt.readUInt16BE(4)).toBe(numTables);
    // WOFF 1.0 records the size of the font it wraps.
    expect(sfnt.length).toBe(woff.readUInt32BE(16));
    for (let i = 0; i < numTables; i += 1)
      expect(sfnt.readUInt32BE(12 + i * 16 + 12)).toBe(
        woff.readUInt32BE(44 + i * 20 + 12),
      );
    expect(() => woffToSfnt(sfnt)).toThrow(/WOFF/);
  });
});

describe("formats", () => {
  it("ledger energy keeps its sign and groups thousands", () => {
    expect(kwh("4326855.140163")).toBe("+4,326,855.1");
    expect(kwh("-41322.500000")).toBe("\u221241,322.5");
    expect(kwh("0")).toBe("0.0");
    expect(band("1234.56")).toBe("±1,234.6");
    expect(band(null)).toBe("—");
  });

  it("shares and percentages", () => {
    expect(share(0.1234)).toBe("12.3 %");
    expect(share(0.0002)).toBe("< 0.1 %");
    expect(share(0)).toBe("0.0 %");
    expect(signedPercent(-0.37)).toBe("\u22120.4 %");
    expect(factor(1000)).toBe("1,000");
    expect(factor(1 / 3.6)).toBe("0.277777778");
  });
});

describe("chart scales", () => {
  it("round steps and an axis that holds zero", () => {
    expect(niceStep(733)).toBe(200);
    expect(niceStep(12)).toBe(2.5);
    expect(axisFor([612, -35])).toEqual({
      min: -200,
      max: 800,
      step: 200,
      ticks: [-200, 0, 200, 400, 600, 800],
    });
    expect(energyScale(9_999).unit).toBe("kWh");
    expect(energyScale(10_000).unit).toBe("MWh");
    expect(tickLabel(-1500, 500)).toBe("\u22121,500");
    expect(tickLabel(0.5, 0.25)).toBe("0.50");
  });
});

describe("formula markup", () => {
  it("reads subscripts, superscripts and nested roots", () => {
    expect(tokens("V_{LL}·I")).toEqual([
      { kind: "text", text: "V" },
      { kind: "sub", text: "LL" },
      { kind: "text", text: "·I" },
    ]);
    expect(tokens("√{Σ(y_{i})^{2}}")).toEqual([
      {
        kind: "root",
        inner: [
          { kind: "text", text: "Σ(y" },
          { kind: "sub", text: "i" },
          { kind: "text", text: ")" },
          { kind: "sup", text: "2" },
        ],
      },
    ]);
    expect(() => tokens("√{3")).toThrow(/Unbalanced/);
  });
});
