import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { axisFor, energyScale, niceStep, tickLabel } from "./charts/scale";
import {
  fontFile,
  registerFonts,
  runs,
  subsetOf,
  woffToSfnt,
} from "./fonts.server";
import { band, factor, kwh, share, signedPercent } from "./format";
import { tokens } from "./formula";
import { flows } from "./sections/site-balance";
import { fitText, textWidth, wrapLines } from "./text";
import type { SiteReport } from "../data/types";

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

describe("the balance diagram's flows", () => {
  it("puts cooling delivered on the way out (heat leaving the site) and closes with Q + W", () => {
    const carrier = (
      c: "heat" | "cooling" | "electricity",
      i: string,
      e = "0",
    ) => ({
      carrier: c,
      importsKwh: i,
      exportsKwh: e,
      netKwh: i,
    });
    const { inflows, outflows } = flows({
      balance: {
        carriers: [
          carrier("heat", "100"),
          carrier("cooling", "40"),
          carrier("electricity", "50", "-10"),
        ],
        netIntoSiteKwh: "100",
        residuals: [],
      },
    } as unknown as SiteReport);
    expect(inflows.map((f) => [f.label, f.kwh])).toEqual([
      ["Heat delivered", 100],
      ["Electricity delivered", 50],
    ]);
    expect(outflows.map((f) => [f.label, f.kwh, f.detail])).toEqual([
      ["Cooling delivered (heat out)", 40, "−40.0 kWh"],
      ["Electricity exported", 10, "−10.0 kWh"],
      ["Used or lost within the site", 100, "+100.0 kWh"],
    ]);
    const sum = (fs: typeof inflows) => fs.reduce((s, f) => s + f.kwh, 0);
    expect(sum(inflows)).toBe(sum(outflows));
  });
});

describe("wrapping", () => {
  it("breaks lines at spaces but never at a no-break space", async () => {
    const { default: PDFDocument } = await import("pdfkit");
    const doc = new PDFDocument({ size: "A4" });
    registerFonts(doc);
    const style = { size: 8 };
    const width = textWidth(doc, "HDD (15.5", style) + 1;
    expect(wrapLines(doc, "HDD (15.5 °C)", width, style)).toEqual([
      "HDD (15.5",
      "°C)",
    ]);
    expect(wrapLines(doc, "HDD (15.5\u00a0°C)", width, style)).toEqual([
      "HDD",
      "(15.5\u00a0°C)",
    ]);
  });
});

describe("fitText", () => {
  it("cuts to the longest prefix that fits, as dropping one character at a time would", async () => {
    const { default: PDFDocument } = await import("pdfkit");
    const doc = new PDFDocument({ size: "A4" });
    registerFonts(doc);
    const style = { size: 8 };
    const text = "Larchmere Depot & Laundry, boiler house heat (ρ·Δh) meter";
    // The plain search this one replaces: drop the last character until the
    // cut with its ellipsis fits.
    const oneAtATime = (width: number) => {
      const chars = [...text];
      while (chars.length > 1) {
        chars.pop();
        const candidate = `${chars.join("").trimEnd()}…`;
        if (textWidth(doc, candidate, style) <= width) return candidate;
      }
      return "…";
    };
    const full = textWidth(doc, text, style);
    for (const width of [
      1,
      8,
      20,
      55,
      90,
      full / 2,
      full - 1,
      full,
      full + 5,
    ]) {
      expect(fitText(doc, text, width, style), `width ${width}`).toBe(
        width >= full ? text : oneAtATime(width),
      );
    }
    // Widths come from the document's cache the second time: the same figure.
    expect(textWidth(doc, text, style)).toBe(full);
  });
});
