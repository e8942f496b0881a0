/** A chart legend: swatches and labels in a row, wrapping when needed. */
import { frame } from "../layout";
import { drawText, textWidth } from "../text";
import { colours, type } from "../theme";

export interface LegendItem {
  label: string;
  color: string;
  shape: "box" | "line" | "hollow";
  /** Fill opacity of a box, 1 by default. */
  opacity?: number;
}

function swatch(
  doc: PDFKit.PDFDocument,
  item: LegendItem,
  x: number,
  y: number,
) {
  if (item.shape === "box")
    doc
      .fillOpacity(item.opacity ?? 1)
      .rect(x, y + 1.5, 9, 7)
      .fill(item.color)
      .fillOpacity(1);
  else if (item.shape === "line") {
    doc
      .moveTo(x - 1, y + 5)
      .lineTo(x + 10, y + 5)
      .lineWidth(1.6)
      .strokeColor(item.color)
      .stroke();
    doc.circle(x + 4.5, y + 5, 2.2).fill(item.color);
  } else
    doc
      .circle(x + 4.5, y + 5, 2.4)
      .lineWidth(1)
      .fillColor(colours.surface)
      .strokeColor(item.color)
      .fillAndStroke();
}

/** Draws the legend at (x, y); returns its height. */
export function drawLegend(
  doc: PDFKit.PDFDocument,
  items: readonly LegendItem[],
  x: number,
  y: number,
  width = frame.right - x,
): number {
  const style = { size: type.small, color: colours.inkMuted };
  let cx = x;
  let cy = y;
  for (const item of items) {
    const w = 14 + textWidth(doc, item.label, style) + 14;
    if (cx + w > x + width && cx > x) {
      cx = x;
      cy += 12;
    }
    swatch(doc, item, cx, cy);
    drawText(doc, item.label, cx + 14, cy + 0.5, style);
    cx += w;
  }
  return cy - y + 12;
}
