// fontkit ships no types; the little of it the report's fonts use
// (app/reports/pdf/shared-fonts.server.ts). pdfkit takes the font as it is.
declare module "fontkit" {
  export interface GlyphPosition {
    xAdvance: number;
    yAdvance: number;
    xOffset: number;
    yOffset: number;
  }
  export interface GlyphRun {
    glyphs: unknown[];
    positions: GlyphPosition[];
    readonly advanceWidth: number;
  }
  export interface Font {
    layout(text: string, features?: unknown): GlyphRun;
  }
  export function create(buffer: Uint8Array, postscriptName?: string): Font;
}
