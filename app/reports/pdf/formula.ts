/**
 * One-line formulas with subscripts, superscripts and a drawn radical sign
 * (the font has no √). Markup: `_{LL}` subscript, `^{2}` superscript,
 * `√{3}` square root; everything else is text.
 */
import { drawText } from "./text";
import { colours } from "./theme";

type Token =
  | { kind: "text" | "sub" | "sup"; text: string }
  | { kind: "root"; inner: Token[] };

/** The text inside the braces that open at `open`, allowing nested braces. */
function braced(source: string, open: number): { body: string; end: number } {
  let depth = 0;
  for (let i = open; i < source.length; i += 1) {
    if (source[i] === "{") depth += 1;
    else if (source[i] === "}" && --depth === 0)
      return { body: source.slice(open + 1, i), end: i + 1 };
  }
  throw new Error(`Unbalanced braces in formula: ${source}`);
}

export function tokens(source: string): Token[] {
  const out: Token[] = [];
  let text = "";
  let i = 0;
  while (i < source.length) {
    const mark = source[i];
    if (
      (mark === "_" || mark === "^" || mark === "√") &&
      source[i + 1] === "{"
    ) {
      if (text) out.push({ kind: "text", text });
      text = "";
      const { body, end } = braced(source, i + 1);
      if (mark === "√") out.push({ kind: "root", inner: tokens(body) });
      else out.push({ kind: mark === "_" ? "sub" : "sup", text: body });
      i = end;
    } else {
      text += mark;
      i += 1;
    }
  }
  if (text) out.push({ kind: "text", text });
  return out;
}

function drawTokens(
  doc: PDFKit.PDFDocument,
  list: readonly Token[],
  x: number,
  y: number,
  size: number,
  color: string,
): number {
  let cx = x;
  for (const token of list) {
    if (token.kind === "root") {
      // Draw the radicand first to learn its width, then the sign over it.
      const start = cx + size * 0.66;
      const inner = drawTokens(doc, token.inner, start, y, size, color);
      const h = size * 1.12;
      const top = y + size * 0.02;
      doc
        .moveTo(cx, top + h * 0.55)
        .lineTo(cx + size * 0.16, top + h * 0.5)
        .lineTo(cx + size * 0.36, top + h * 0.95)
        .lineTo(cx + size * 0.6, top)
        .lineTo(start + inner + 1, top)
        .lineWidth(size * 0.06)
        .strokeColor(color)
        .stroke();
      cx = start + inner + 1.5;
    } else if (token.kind === "text") {
      cx += drawText(doc, token.text, cx, y, { size, color });
    } else {
      const small = size * 0.72;
      const dy = token.kind === "sub" ? size * 0.42 : -size * 0.18;
      cx +=
        drawText(doc, token.text, cx + 0.3, y + dy, { size: small, color }) +
        0.6;
    }
  }
  return cx - x;
}

/** Draws the formula with its top at y; returns its width. */
export function drawFormula(
  doc: PDFKit.PDFDocument,
  source: string,
  x: number,
  y: number,
  size: number,
  color: string = colours.ink,
): number {
  return drawTokens(doc, tokens(source), x, y, size, color);
}
