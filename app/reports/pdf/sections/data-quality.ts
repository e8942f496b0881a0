/** The data behind the figures: hours actual, estimated, edited, missing. */
import type { DataQuality, MeterQuality, ReportData } from "../../data/types";
import { compactDateTime, integer, share } from "../format";
import { body, heading, space } from "../layout";
import { drawTable, widths, type Cell, type Row } from "../table";
import { colours } from "../theme";
import { carrierLabels } from "~/sites/meter-kinds";

function summary(q: DataQuality): string {
  const of = (n: number) =>
    q.expectedHours > 0 ? ` (${share(n / q.expectedHours, 2)})` : "";
  return [
    `Of ${integer(q.expectedHours)} meter-hours expected in the period, ${integer(q.measuredHours)} were actual readings${of(q.measuredHours)}, ${integer(q.estimatedHours)} estimated${of(q.estimatedHours)}, ${integer(q.editedHours)} edited and ${integer(q.missingHours)} missing${of(q.missingHours)}.`,
    `${q.silentMeters} meter${q.silentMeters === 1 ? " had" : "s had"} no data for ${q.silentAfterHours} hours or more at a stretch.`,
    `${integer(q.conflicts)} reading${q.conflicts === 1 ? "" : "s"} disagreed with one already stored and ${q.conflicts === 1 ? "was" : "were"} kept for review (${integer(q.openConflicts)} still open).`,
  ].join(" ");
}

function hoursCell(value: number, tone: string): Cell {
  return value > 0
    ? { text: integer(value), color: tone, weight: "semibold" }
    : { text: "0", color: colours.inkFaint };
}

function meterRow(m: MeterQuality, silentAfter: number): Row {
  const facts = [
    carrierLabels[m.carrier],
    m.subMeter ? "sub-meter" : null,
    m.orientation === "export" ? "export" : null,
    m.retired ? "retired" : null,
  ].filter(Boolean);
  return {
    cells: [
      [
        { text: m.code, weight: "semibold" as const },
        { text: ` · ${facts.join(", ")}`, color: colours.inkMuted },
      ],
      integer(m.expectedHours),
      integer(m.measuredHours),
      hoursCell(m.estimatedHours, colours.caution700),
      hoursCell(m.editedHours, colours.caution700),
      hoursCell(m.missingHours, colours.danger600),
      m.longestSilentHours >= silentAfter
        ? {
            text: integer(m.longestSilentHours),
            color: colours.danger600,
            weight: "semibold",
          }
        : integer(m.longestSilentHours),
      m.conflicts ? `${m.conflicts} (${m.openConflicts} open)` : "0",
    ],
  };
}

/** Follows the adjusting entries on their page when it fits. */
export function drawDataQuality(
  doc: PDFKit.PDFDocument,
  data: ReportData,
): void {
  space(doc, 18);
  heading(doc, "Data quality", 1, 200);
  const q = data.dataQuality;
  body(doc, summary(q));
  body(
    doc,
    `Expected hours are those in the period while each meter was installed, in its site's time zone, up to the time of generation (${compactDateTime(data.generatedAt, data.timeZone)}). Estimated hours fill gaps and are marked so in every total; edited hours were corrected by hand with a reason. The longest gap is the longest run of hours without an actual reading.`,
    { color: colours.inkMuted, size: 8.5 },
  );
  space(doc, 4);
  if (q.meters.length === 0) {
    body(doc, "No meter was installed during the period.");
    return;
  }
  const w = widths(2.6, 0.95, 0.95, 1, 0.8, 0.85, 0.95, 1);
  const rows: Row[] = [];
  q.meters.forEach((m, i) => {
    if (m.siteName !== q.meters[i - 1]?.siteName)
      rows.push({ kind: "band", cells: [m.siteName] });
    rows.push(meterRow(m, q.silentAfterHours));
  });
  drawTable(doc, {
    columns: [
      { header: "Meter", width: w[0] },
      { header: "Expected (h)", width: w[1], align: "right" },
      { header: "Actual (h)", width: w[2], align: "right" },
      { header: "Estimated (h)", width: w[3], align: "right" },
      { header: "Edited (h)", width: w[4], align: "right" },
      { header: "Missing (h)", width: w[5], align: "right" },
      { header: "Longest gap (h)", width: w[6], align: "right" },
      { header: "Conflicts", width: w[7], align: "right" },
    ],
    rows: [
      ...rows,
      {
        kind: "total",
        cells: [
          "All meters",
          integer(q.expectedHours),
          integer(q.measuredHours),
          integer(q.estimatedHours),
          integer(q.editedHours),
          integer(q.missingHours),
          "",
          `${q.conflicts} (${q.openConflicts} open)`,
        ],
      },
    ],
    caption: "Data quality",
    size: 7.8,
  });
}
