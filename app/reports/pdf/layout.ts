/**
 * The page frame: the content box, the cursor, page breaks and headings,
 * and — once everything is drawn — the running header and footer of every
 * page (report id, organisation, "page n of N").
 */
import type { ReportData } from "../data/types";
import { statusTitle } from "./status";
import { drawText, paragraph, paragraphHeight, type TextStyle } from "./text";
import { colours, contentWidth, page, type } from "./theme";

export const frame = {
  left: page.margins.left,
  right: page.width - page.margins.right,
  top: page.margins.top,
  bottom: page.height - page.margins.bottom,
  width: contentWidth,
} as const;

export function newPage(doc: PDFKit.PDFDocument): void {
  doc.addPage();
  doc.x = frame.left;
  doc.y = frame.top;
}

/** Starts a new page unless `height` points still fit below the cursor. */
export function ensureSpace(doc: PDFKit.PDFDocument, height: number): void {
  if (doc.y + height > frame.bottom) newPage(doc);
}

export function space(doc: PDFKit.PDFDocument, points: number): void {
  doc.y += points;
}

/** The 0-based index of the page being drawn. */
export function currentPageIndex(doc: PDFKit.PDFDocument): number {
  const range = doc.bufferedPageRange();
  return range.start + range.count - 1;
}

// The page of every level-1 heading, in order: where each section starts.
const sectionPages = new WeakMap<PDFKit.PDFDocument, number[]>();

/** Pages (0-based) of the level-1 headings drawn so far. */
export function headingPages(doc: PDFKit.PDFDocument): readonly number[] {
  return sectionPages.get(doc) ?? [];
}

const headingStyle: Record<1 | 2 | 3, TextStyle> = {
  1: { size: type.h1, weight: "semibold", color: colours.ink },
  2: { size: type.h2, weight: "semibold", color: colours.ink },
  3: { size: type.h3, weight: "semibold", color: colours.spruce700 },
};

/**
 * A heading kept with what follows it: it moves to a new page unless
 * `keepWith` more points fit below it. Level 1 also adds a bookmark.
 */
export function heading(
  doc: PDFKit.PDFDocument,
  text: string,
  level: 1 | 2 | 3,
  keepWith = 60,
): void {
  const style = headingStyle[level];
  const height = paragraphHeight(doc, text, frame.width, style, 0);
  ensureSpace(doc, height + keepWith);
  if (level === 1) {
    doc.outline.addItem(text);
    sectionPages.set(doc, [...headingPages(doc), currentPageIndex(doc)]);
  }
  paragraph(doc, text, { style, lineGap: 0 });
  if (level === 1) {
    doc
      .moveTo(frame.left, doc.y + 3)
      .lineTo(frame.left + 36, doc.y + 3)
      .lineWidth(2)
      .strokeColor(colours.copper600)
      .stroke();
    space(doc, 12);
  } else space(doc, level === 2 ? 5 : 3);
}

/** Body text at the cursor. */
export function body(
  doc: PDFKit.PDFDocument,
  content: Parameters<typeof paragraph>[1],
  options: { size?: number; color?: string; after?: number; x?: number } = {},
): void {
  const x = options.x ?? frame.left;
  paragraph(doc, content, {
    x,
    width: frame.right - x,
    style: { size: options.size ?? type.body, color: options.color },
    after: options.after ?? 5,
  });
}

function drawRunningHeader(doc: PDFKit.PDFDocument, data: ReportData) {
  const y = 30;
  const left = `${data.organization.name} · ${data.scope.label} · ${data.period.label}`;
  drawText(doc, "Joulebook", frame.left, y, {
    size: type.small,
    weight: "bold",
    color: colours.spruce700,
  });
  drawText(doc, left, frame.left + 50, y, {
    size: type.small,
    color: colours.inkMuted,
    width: frame.width - 170,
  });
  const status = statusTitle(data);
  drawText(doc, status, frame.right - 120, y, {
    size: type.small,
    weight: "semibold",
    color: data.allMonthsClosed ? colours.spruce700 : colours.caution700,
    width: 120,
    align: "right",
  });
  doc
    .moveTo(frame.left, y + 14)
    .lineTo(frame.right, y + 14)
    .lineWidth(0.5)
    .strokeColor(colours.line)
    .stroke();
}

function drawFooter(
  doc: PDFKit.PDFDocument,
  data: ReportData,
  index: number,
  count: number,
) {
  const y = page.height - 36;
  doc
    .moveTo(frame.left, y - 6)
    .lineTo(frame.right, y - 6)
    .lineWidth(0.5)
    .strokeColor(colours.line)
    .stroke();
  drawText(
    doc,
    `Report ${data.reportId} · ${data.organization.name}`,
    frame.left,
    y,
    { size: type.small, color: colours.inkMuted, width: frame.width - 90 },
  );
  drawText(doc, `Page ${index + 1} of ${count}`, frame.right - 90, y, {
    size: type.small,
    color: colours.inkMuted,
    width: 90,
    align: "right",
  });
}

/**
 * Header (from page 2) and footer on every buffered page. The bottom margin
 * is set to 0 while the footer is drawn: text below the margin would
 * otherwise make pdfkit start a new, blank page.
 */
export function drawPageFurniture(
  doc: PDFKit.PDFDocument,
  data: ReportData,
): number {
  const { start, count } = doc.bufferedPageRange();
  for (let i = start; i < start + count; i += 1) {
    doc.switchToPage(i);
    const margins = { ...doc.page.margins };
    doc.page.margins = { ...margins, top: 0, bottom: 0 };
    if (i > start) drawRunningHeader(doc, data);
    drawFooter(doc, data, i - start, count);
    doc.page.margins = margins;
  }
  return count;
}
