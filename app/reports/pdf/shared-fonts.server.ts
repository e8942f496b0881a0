/**
 * One parsed font per face for the whole process, whose glyph layouts are
 * kept across documents. pdfkit parses a registered font again in every
 * document and keeps each word's layout (fontkit's shaping: substitutions,
 * kerning) only for that document, so every report laid out its figures,
 * labels and units from scratch: most of its drawing time. Layout depends
 * on the font and the text alone, so a run laid out once serves every later
 * document.
 *
 * pdfkit scales the positions of a run it is given in place, so each call
 * gets its own copy of the positions; the glyphs are shared (read only).
 */
import { create, type Font, type GlyphPosition, type GlyphRun } from "fontkit";

/** Distinct runs kept per face; past this the cache starts afresh. */
const MAX_RUNS = 20_000;

interface LaidOut {
  glyphs: unknown[];
  positions: GlyphPosition[];
}

function copyRun(run: LaidOut): GlyphRun {
  const positions = run.positions.map((p) => ({ ...p }));
  return {
    glyphs: run.glyphs,
    positions,
    // As fontkit's GlyphRun: the sum of the (possibly scaled) advances.
    get advanceWidth() {
      let width = 0;
      for (const p of positions) width += p.xAdvance;
      return width;
    },
  };
}

/** The font, with `layout` answered from the process-wide cache. */
function withSharedLayouts(font: Font): Font {
  const runs = new Map<string, LaidOut>();
  const shared = Object.create(font) as Font;
  shared.layout = (text: string, features?: unknown) => {
    // pdfkit passes features only when a caller asks for some: not cached.
    if (features) return font.layout(text, features);
    let run = runs.get(text);
    if (!run) {
      const fresh = font.layout(text);
      run = {
        glyphs: fresh.glyphs,
        positions: fresh.positions.map((p) => ({ ...p })),
      };
      if (runs.size >= MAX_RUNS) runs.clear();
      runs.set(text, run);
    }
    return copyRun(run);
  };
  return shared;
}

const fonts = new Map<string, Font>();

/** The shared font for these bytes, keyed by the caller's name for them. */
export function sharedFont(key: string, bytes: () => Buffer): Font {
  let font = fonts.get(key);
  if (!font) {
    font = withSharedLayouts(create(bytes()));
    fonts.set(key, font);
  }
  return font;
}
