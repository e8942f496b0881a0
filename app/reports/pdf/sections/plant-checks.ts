/**
 * Plant checked against the laws, under data quality: a month in which a
 * boiler, CHP, heat pump, chiller or fuel cell gave out more than the laws
 * allow is a meter reading wrongly, listed here and never counted as a
 * result.
 */
import type { ReportData } from "../../data/types";
import { monthLong } from "~/lib/format";
import { body, heading, space } from "../layout";
import { drawTable, widths } from "../table";
import { colours } from "../theme";

export function drawPlantChecks(
  doc: PDFKit.PDFDocument,
  data: ReportData,
): void {
  const { plants, faults } = data.plantChecks;
  if (plants === 0) return;
  space(doc, 12);
  heading(doc, "Plant checked against the laws", 2, 120);
  if (faults.length === 0) {
    body(
      doc,
      `${plants === 1 ? "The one plant" : `All ${plants} plants`} in scope stayed within what the first and second laws allow in every month of the period with data.`,
    );
    return;
  }
  body(
    doc,
    `${faults.length} plant month${faults.length === 1 ? "" : "s"} went beyond what the laws allow. Each is a meter reading wrongly on that plant, not a result: check the meters named before using these months.`,
    { color: colours.danger600 },
  );
  space(doc, 4);
  const w = widths(1.1, 1.6, 3.6, 1.3);
  drawTable(doc, {
    columns: [
      { header: "Month", width: w[0] },
      { header: "Plant", width: w[1], wrap: true },
      { header: "Finding", width: w[2], wrap: true },
      { header: "Meters", width: w[3], wrap: true },
    ],
    rows: faults.map((f) => ({
      cells: [
        monthLong(f.month),
        `${f.plantName} (${f.kindLabel}), ${f.siteName}`,
        f.text,
        f.meterCodes.join(", "),
      ],
    })),
    caption: "Plant checked against the laws",
    size: 7.8,
  });
}
