/**
 * Tables: a tinted header that repeats after every page break, numbers
 * right-aligned, band rows that name a group (a carrier), total rows set
 * off by a rule. Cells in a `wrap` column break into lines; the others are
 * cut with an ellipsis rather than overflow.
 */
import type { Weight } from "./fonts.server";
import { ensureSpace, frame, newPage } from "./layout";
import { drawText, wrapLines, type TextStyle } from "./text";
import { colours, type } from "./theme";

export interface Column {
  header: string;
  width: number;
  align?: "left" | "right" | "center";
  wrap?: boolean;
}

export interface Cell {
  text: string;
  color?: string;
  weight?: Weight;
}

/** Pieces of one line in different weights or colours. */
export type Spans = Cell[];

export interface Row {
  cells: (string | Cell | Spans)[];
  /** band: one label across the table; total: set off by a rule. */
  kind?: "body" | "band" | "total";
}

export interface TableSpec {
  columns: Column[];
  rows: Row[];
  /** Shown above the header when the table continues on a new page. */
  caption?: string;
  size?: number;
  /** Rows that must fit under the header before the table starts. */
  keepRows?: number;
}

const PAD_X = 4;
const PAD_Y = 3;

const cellOf = (cell: string | Cell | Spans): Cell =>
  typeof cell === "string"
    ? { text: cell }
    : Array.isArray(cell)
      ? { text: cell.map((c) => c.text).join(""), weight: cell[0]?.weight }
      : cell;

/** Spans side by side, cut with an ellipsis when the line is full. */
function drawSpans(
  doc: PDFKit.PDFDocument,
  spans: Spans,
  x: number,
  y: number,
  width: number,
  size: number,
) {
  let left = x;
  for (const span of spans) {
    const room = x + width - left;
    if (room <= 4) break;
    const style = {
      size,
      weight: span.weight,
      color: span.color ?? colours.ink,
    };
    left += drawText(doc, span.text, left, y, { ...style, width: room });
  }
}

function lineHeight(size: number) {
  return size * 1.28;
}

function headerLines(doc: PDFKit.PDFDocument, spec: TableSpec, size: number) {
  const style: TextStyle = { size, weight: "semibold" };
  return spec.columns.map((c) =>
    wrapLines(doc, c.header, c.width - 2 * PAD_X, style),
  );
}

function drawHeader(doc: PDFKit.PDFDocument, spec: TableSpec, size: number) {
  const lines = headerLines(doc, spec, size);
  const height =
    Math.max(...lines.map((l) => l.length)) * lineHeight(size) + 2 * PAD_Y;
  const top = doc.y;
  doc.rect(frame.left, top, tableWidth(spec), height).fill(colours.sunken);
  let x = frame.left;
  spec.columns.forEach((column, i) => {
    // Headers sit on the bottom line, like the numbers under them.
    const y0 = top + height - PAD_Y - lines[i].length * lineHeight(size);
    lines[i].forEach((line, j) => {
      drawText(doc, line, x + PAD_X, y0 + j * lineHeight(size) + 0.6, {
        size,
        weight: "semibold",
        color: colours.inkMuted,
        width: column.width - 2 * PAD_X,
        align: column.align ?? "left",
      });
    });
    x += column.width;
  });
  doc.y = top + height;
}

function tableWidth(spec: TableSpec): number {
  return spec.columns.reduce((s, c) => s + c.width, 0);
}

function rowLines(
  doc: PDFKit.PDFDocument,
  spec: TableSpec,
  row: Row,
  size: number,
): string[][] {
  return row.cells.map((raw, i) => {
    const cell = cellOf(raw);
    const column = spec.columns[i];
    if (!column?.wrap) return [cell.text];
    return wrapLines(doc, cell.text, column.width - 2 * PAD_X, {
      size,
      weight: cell.weight,
    });
  });
}

function rowHeight(lines: string[][], size: number): number {
  return (
    Math.max(1, ...lines.map((l) => l.length)) * lineHeight(size) + 2 * PAD_Y
  );
}

function drawBand(
  doc: PDFKit.PDFDocument,
  spec: TableSpec,
  row: Row,
  size: number,
) {
  const cell = cellOf(row.cells[0]);
  const height = lineHeight(size) + 2 * PAD_Y;
  doc.rect(frame.left, doc.y, tableWidth(spec), height).fill(colours.spruce50);
  drawText(doc, cell.text, frame.left + PAD_X, doc.y + PAD_Y + 0.6, {
    size,
    weight: cell.weight ?? "semibold",
    color: cell.color ?? colours.spruce700,
    width: tableWidth(spec) - 2 * PAD_X,
  });
  doc.y += height;
}

function drawBodyRow(
  doc: PDFKit.PDFDocument,
  spec: TableSpec,
  row: Row,
  lines: string[][],
  size: number,
  striped: boolean,
) {
  const height = rowHeight(lines, size);
  const top = doc.y;
  const width = tableWidth(spec);
  if (row.kind === "total") {
    doc.rect(frame.left, top, width, height).fill("#f4f1ea");
    doc
      .moveTo(frame.left, top)
      .lineTo(frame.left + width, top)
      .lineWidth(0.8)
      .strokeColor(colours.lineStrong)
      .stroke();
  } else if (striped) doc.rect(frame.left, top, width, height).fill("#faf8f4");
  let x = frame.left;
  spec.columns.forEach((column, i) => {
    const raw = row.cells[i] ?? "";
    if (Array.isArray(raw) && !column.wrap) {
      drawSpans(
        doc,
        raw,
        x + PAD_X,
        top + PAD_Y + 0.6,
        column.width - 2 * PAD_X,
        size,
      );
      x += column.width;
      return;
    }
    const cell = cellOf(raw);
    lines[i]?.forEach((line, j) => {
      drawText(doc, line, x + PAD_X, top + PAD_Y + 0.6 + j * lineHeight(size), {
        size,
        weight: cell.weight ?? (row.kind === "total" ? "semibold" : "regular"),
        color: cell.color ?? colours.ink,
        width: column.width - 2 * PAD_X,
        align: column.align ?? "left",
      });
    });
    x += column.width;
  });
  doc
    .moveTo(frame.left, top + height)
    .lineTo(frame.left + width, top + height)
    .lineWidth(0.4)
    .strokeColor(colours.line)
    .stroke();
  doc.y = top + height;
}

function continueOnNewPage(
  doc: PDFKit.PDFDocument,
  spec: TableSpec,
  size: number,
) {
  newPage(doc);
  if (spec.caption) {
    drawText(doc, `${spec.caption} (continued)`, frame.left, doc.y, {
      size: type.small,
      weight: "italic",
      color: colours.inkMuted,
    });
    doc.y += type.small + 5;
  }
  drawHeader(doc, spec, size);
}

export function drawTable(doc: PDFKit.PDFDocument, spec: TableSpec): void {
  const size = spec.size ?? type.table;
  const single = lineHeight(size) + 2 * PAD_Y;
  const headerHeight =
    Math.max(...headerLines(doc, spec, size).map((l) => l.length)) *
      lineHeight(size) +
    2 * PAD_Y;
  ensureSpace(
    doc,
    headerHeight + single * Math.min(spec.keepRows ?? 3, spec.rows.length),
  );
  drawHeader(doc, spec, size);
  let striped = false;
  let group: Row | null = null;
  const breakPage = () => {
    continueOnNewPage(doc, spec, size);
    // The group a page break falls into is named again at the top.
    if (group) {
      const label = cellOf(group.cells[0]);
      drawBand(
        doc,
        spec,
        { ...group, cells: [{ ...label, text: `${label.text} (continued)` }] },
        size,
      );
    }
  };
  spec.rows.forEach((row, index) => {
    if (row.kind === "band") {
      // A group label never ends a page: it keeps two rows with it.
      const next = spec.rows[index + 1] ? single : 0;
      group = null;
      if (doc.y + single + next * 2 > frame.bottom) breakPage();
      group = row;
      drawBand(doc, spec, row, size);
      striped = false;
      return;
    }
    const lines = rowLines(doc, spec, row, size);
    // Total rows never open a page alone: the row before goes with them.
    let needed = rowHeight(lines, size);
    if (row.kind !== "total")
      for (const next of spec.rows.slice(index + 1)) {
        if (next.kind !== "total") break;
        needed += rowHeight(rowLines(doc, spec, next, size), size);
      }
    if (doc.y + needed > frame.bottom) breakPage();
    drawBodyRow(doc, spec, row, lines, size, striped && row.kind !== "total");
    striped = !striped;
  });
  doc.x = frame.left;
}

/** Column widths from proportions, filling the content width exactly. */
export function widths(...parts: number[]): number[] {
  const total = parts.reduce((s, p) => s + p, 0);
  return parts.map((p) => (frame.width * p) / total);
}
