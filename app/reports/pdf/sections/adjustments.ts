/** Every adjusting entry recorded against the period's months. */
import { sumDecimals } from "../../data/decimal";
import type { ReportData } from "../../data/types";
import { monthShort } from "~/lib/format";
import { compactDateTime, integer, kwh } from "../format";
import { body, heading, newPage } from "../layout";
import { drawTable, widths } from "../table";
import { colours } from "../theme";

const sourceNames: Record<string, string> = {
  late_data: "Late readings",
  edit: "Edit",
  estimate: "Estimate",
  calorific_value: "Calorific value",
};

export function drawAdjustments(
  doc: PDFKit.PDFDocument,
  data: ReportData,
): void {
  newPage(doc);
  heading(doc, "Adjusting entries", 1);
  const entries = data.adjustments;
  if (entries.length === 0) {
    body(
      doc,
      "No adjusting entries were recorded against the months of this period. A closed month's figures change only through an adjusting entry, with its author, reason and time.",
    );
    return;
  }
  body(doc, [
    {
      text: `${integer(entries.length)} adjusting entr${entries.length === 1 ? "y" : "ies"}, `,
    },
    {
      text: `${kwh(sumDecimals(entries.map((e) => e.deltaKwh)))} kWh`,
      weight: "semibold",
    },
    {
      text: ` in all. An adjusting entry records a change to a closed month (late readings, an edit or an estimate) beside the closed figures, which stay as they were when the month was closed. Times are in ${data.timeZone}.`,
    },
  ]);
  const w = widths(1.05, 0.65, 1.3, 0.95, 0.7, 0.95, 2.8);
  drawTable(doc, {
    columns: [
      { header: "Recorded", width: w[0] },
      { header: "Month", width: w[1] },
      { header: "Meter (site)", width: w[2], wrap: true },
      { header: "Change (kWh)", width: w[3], align: "right" },
      { header: "Source", width: w[4], wrap: true },
      { header: "By", width: w[5], wrap: true },
      { header: "Reason", width: w[6], wrap: true },
    ],
    rows: entries.map((e) => ({
      cells: [
        compactDateTime(e.recordedAt, data.timeZone),
        monthShort(e.month),
        `${e.meterCode}${e.subMeter ? " (sub-meter)" : ""}, ${e.siteName}`,
        { text: kwh(e.deltaKwh), weight: "semibold" },
        sourceNames[e.source] ?? e.source,
        e.author,
        { text: e.reason, color: colours.inkMuted },
      ],
    })),
    caption: "Adjusting entries",
  });
}
