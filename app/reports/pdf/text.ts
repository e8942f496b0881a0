/**
 * Text drawing with the font fallback of fonts.ts: single lines placed
 * exactly (table cells, labels) and flowing paragraphs that may break
 * across pages. Every piece of report text goes through here, so no
 * character is drawn with a face that lacks it.
 */
import { runs, type Run, type Weight } from "./fonts.server";
import { colours, page } from "./theme";

export interface TextStyle {
  size: number;
  weight?: Weight;
  color?: string;
}

/** A piece of a paragraph with its own weight or colour. */
export interface Span {
  text: string;
  weight?: Weight;
  color?: string;
}

// Widths of runs already measured in a document, by face, size and text.
// A report draws the same labels, units and figures again and again (every
// table row, every chart axis); each measurement is a full glyph layout in
// pdfkit, so each distinct one is made once per document.
const measuredWidths = new WeakMap<PDFKit.PDFDocument, Map<string, number>>();

function runWidth(doc: PDFKit.PDFDocument, run: Run, size: number): number {
  let widths = measuredWidths.get(doc);
  if (!widths) {
    widths = new Map();
    measuredWidths.set(doc, widths);
  }
  const key = `${run.face}\u0000${size}\u0000${run.text}`;
  let width = widths.get(key);
  if (width === undefined) {
    doc.font(run.face).fontSize(size);
    width = doc.widthOfString(run.text);
    widths.set(key, width);
  }
  return width;
}

interface MeasuredText {
  runs: Run[];
  widths: number[];
  width: number;
}

function measure(
  doc: PDFKit.PDFDocument,
  text: string,
  style: TextStyle,
): MeasuredText {
  const pieces = runs(text, style.weight ?? "regular");
  const widths = pieces.map((run) => runWidth(doc, run, style.size));
  return {
    runs: pieces,
    widths,
    width: widths.reduce((sum, w) => sum + w, 0),
  };
}

export function textWidth(
  doc: PDFKit.PDFDocument,
  text: string,
  style: TextStyle,
): number {
  return measure(doc, text, style).width;
}

/** Cuts text to fit a width, ending it with an ellipsis. */
export function fitText(
  doc: PDFKit.PDFDocument,
  text: string,
  width: number,
  style: TextStyle,
): string {
  if (textWidth(doc, text, style) <= width) return text;
  const chars = [...text];
  const cut = (keep: number) => `${chars.slice(0, keep).join("").trimEnd()}…`;
  // The longest cut that fits, by bisection: a longer cut is never narrower,
  // so this is the cut that dropping one character at a time would find.
  let fits = 0;
  let tooWide = chars.length;
  while (tooWide - fits > 1) {
    const mid = (fits + tooWide) >> 1;
    if (textWidth(doc, cut(mid), style) <= width) fits = mid;
    else tooWide = mid;
  }
  return fits >= 1 ? cut(fits) : "…";
}

/**
 * One line of text at (x, y), its top at y; aligned within `width` when
 * given, and cut with an ellipsis if it would not fit. Returns its width.
 */
export function drawText(
  doc: PDFKit.PDFDocument,
  text: string,
  x: number,
  y: number,
  style: TextStyle & { width?: number; align?: "left" | "right" | "center" },
): number {
  let shown = measure(doc, text, style);
  if (style.width !== undefined && shown.width > style.width)
    shown = measure(doc, fitText(doc, text, style.width, style), style);
  let left = x;
  if (style.width !== undefined && style.align === "right")
    left = x + style.width - shown.width;
  else if (style.width !== undefined && style.align === "center")
    left = x + (style.width - shown.width) / 2;
  doc.fillColor(style.color ?? colours.ink);
  shown.runs.forEach((run, i) => {
    doc.font(run.face).fontSize(style.size);
    doc.text(run.text, left, y, { lineBreak: false });
    left += shown.widths[i];
  });
  return shown.width;
}

export interface ParagraphOptions {
  x?: number;
  width?: number;
  style: TextStyle;
  /** Extra space between lines, points. */
  lineGap?: number;
  /** Space after the paragraph, points. */
  after?: number;
}

function spansOf(content: string | readonly Span[]): readonly Span[] {
  return typeof content === "string" ? [{ text: content }] : content;
}

/**
 * A flowing paragraph at the cursor (doc.y), wrapping within `width` and
 * continuing on a new page when it reaches the bottom margin.
 */
export function paragraph(
  doc: PDFKit.PDFDocument,
  content: string | readonly Span[],
  options: ParagraphOptions,
): void {
  const x = options.x ?? page.margins.left;
  const width = options.width ?? page.width - page.margins.right - x;
  const pieces = spansOf(content).flatMap((span) =>
    runs(span.text, span.weight ?? options.style.weight ?? "regular").map(
      (run) => ({ ...run, color: span.color ?? options.style.color }),
    ),
  );
  // A piece that starts with a space would start a wrapped line with it:
  // the space moves to the end of the piece before (a Latin face has one).
  for (let i = 1; i < pieces.length; i += 1) {
    const before = pieces[i - 1];
    if (pieces[i].text.startsWith(" ") && before.face.startsWith("latin-")) {
      before.text += " ";
      pieces[i].text = pieces[i].text.slice(1);
    }
  }
  const startY = doc.y;
  pieces
    .filter((p) => p.text !== "")
    .forEach((piece, i, list) => {
      doc
        .font(piece.face)
        .fontSize(options.style.size)
        .fillColor(piece.color ?? colours.ink);
      const settings = {
        width,
        lineGap: options.lineGap ?? 1.5,
        continued: i < list.length - 1,
      };
      if (i === 0) doc.text(piece.text, x, startY, settings);
      else doc.text(piece.text, settings);
    });
  doc.x = page.margins.left;
  doc.y += options.after ?? 0;
}

/** The height a paragraph will take (Latin metrics; close enough to plan a page). */
export function paragraphHeight(
  doc: PDFKit.PDFDocument,
  content: string | readonly Span[],
  width: number,
  style: TextStyle,
  lineGap = 1.5,
): number {
  const text = spansOf(content)
    .map((s) => s.text)
    .join("");
  doc.font(`latin-${style.weight ?? "regular"}`).fontSize(style.size);
  return doc.heightOfString(text, { width, lineGap });
}

/** Where a line may break: any white space but the no-break space. */
const BREAK = /[^\S\u00a0]+/;

/**
 * Greedy word wrap into lines no wider than `width`; a word longer than the
 * line is cut with an ellipsis rather than overflow. A no-break space holds
 * its neighbours together ("15.5 °C").
 */
export function wrapLines(
  doc: PDFKit.PDFDocument,
  text: string,
  width: number,
  style: TextStyle,
): string[] {
  const lines: string[] = [];
  for (const paragraphText of text.split("\n")) {
    let line = "";
    for (const word of paragraphText.split(BREAK).filter(Boolean)) {
      const candidate = line ? `${line} ${word}` : word;
      if (!line || textWidth(doc, candidate, style) <= width) line = candidate;
      else {
        lines.push(fitText(doc, line, width, style));
        line = word;
      }
    }
    lines.push(fitText(doc, line, width, style));
  }
  return lines;
}
