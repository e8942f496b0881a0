/** The standing cautions, as the last section of every report. */
import type { ReportData } from "../../data/types";
import { ensureSpace, frame, heading, space } from "../layout";
import { drawText, paragraph, paragraphHeight } from "../text";
import { colours, type } from "../theme";

export function drawCautionsSection(
  doc: PDFKit.PDFDocument,
  data: ReportData,
): void {
  space(doc, 16);
  const width = frame.width - 40;
  const heights = data.cautions.map(
    (c) => paragraphHeight(doc, c, width, { size: type.body }) + 6,
  );
  const height = 24 + heights.reduce((s, h) => s + h, 0);
  ensureSpace(doc, height + 40);
  heading(doc, "Cautions", 1, height);
  const top = doc.y;
  doc
    .roundedRect(frame.left, top, frame.width, height, 6)
    .fill(colours.caution50);
  doc.rect(frame.left, top, 5, height).fill(colours.caution700);
  doc.y = top + 12;
  data.cautions.forEach((caution) => {
    drawText(doc, "•", frame.left + 18, doc.y, {
      size: type.body,
      color: colours.caution700,
      weight: "bold",
    });
    paragraph(doc, caution, {
      x: frame.left + 30,
      width,
      style: { size: type.body },
      after: 6,
    });
  });
  doc.y = top + height + 8;
}
