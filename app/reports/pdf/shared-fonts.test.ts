/**
 * The process-wide fonts (shared-fonts.server.ts) must lay out exactly as a
 * freshly parsed font does, every time: pdfkit scales a run's positions in
 * place, so a cached run handed out twice must not come back scaled.
 */
import { readFileSync } from "node:fs";
import { create } from "fontkit";
import PDFDocument from "pdfkit";
import { describe, expect, it } from "vitest";
import { fontFile, woffToSfnt } from "./fonts.server";
import { sharedFont } from "./shared-fonts.server";

const bytes = () => woffToSfnt(readFileSync(fontFile("latin", "semibold")));
const texts = ["Heat", "office,", "+12,345.6", "ffi fl", "Łódź", "kWh\u00a0"];

const plain = (run: ReturnType<ReturnType<typeof create>["layout"]>) => ({
  positions: run.positions.map((p) => ({ ...p })),
  advanceWidth: run.advanceWidth,
});

describe("shared report fonts", () => {
  it("lay out as a fresh font does, however often pdfkit scales the result", () => {
    const fresh = create(bytes());
    const shared = sharedFont("test-latin-semibold", bytes);
    for (let round = 0; round < 3; round++)
      for (const text of texts) {
        const run = shared.layout(text);
        expect(plain(run)).toEqual(plain(fresh.layout(text)));
        // What pdfkit's layoutRun does to every run it is given.
        for (const p of run.positions) p.xAdvance *= 1000;
      }
  });

  it("measure text in a second document as in the first", () => {
    const widths = () => {
      const doc = new PDFDocument();
      doc.registerFont(
        "shared",
        sharedFont("test-latin-semibold", bytes) as unknown as Buffer,
      );
      doc.font("shared").fontSize(9);
      return texts.map((t) => doc.widthOfString(t));
    };
    const first = widths();
    expect(widths()).toEqual(first);
    const reference = new PDFDocument();
    reference.registerFont("own", bytes());
    reference.font("own").fontSize(9);
    expect(first).toEqual(texts.map((t) => reference.widthOfString(t)));
  });
});
