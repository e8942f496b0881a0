/**
 * The summary: each month's status, the totals per carrier (the ledger's
 * own totals for the period), each site's figures per carrier, and the
 * energy delivered and exported per month by carrier as a chart. Unlike
 * carriers are never added into one kWh figure.
 */
import type { EntryTotal, ReportData } from "../../data/types";
import { monthShort } from "~/lib/format";
import { chartHeight, drawMonthlyChart } from "../charts/monthly-chart";
import { monthlyByCarrier } from "./site-charts";
import { band, kwh, share } from "../format";
import { body, ensureSpace, frame, heading, space } from "../layout";
import { drawTable, widths, type Row } from "../table";
import { drawText } from "../text";
import { carrierColours, colours, type } from "../theme";
import { carrierLabels } from "~/sites/meter-kinds";

function drawMonthStrip(doc: PDFKit.PDFDocument, data: ReportData) {
  const n = data.months.length;
  const gap = 4;
  const boxWidth = Math.min((frame.width - gap * (n - 1)) / n, 120);
  const height = 30;
  ensureSpace(doc, height + 8);
  const top = doc.y;
  data.months.forEach((m, i) => {
    const x = frame.left + i * (boxWidth + gap);
    if (m.closed)
      doc.roundedRect(x, top, boxWidth, height, 3).fill(colours.spruce700);
    else
      doc
        .roundedRect(x, top, boxWidth, height, 3)
        .lineWidth(0.8)
        .fillColor(colours.caution50)
        .strokeColor(colours.caution700)
        .fillAndStroke();
    const label = n > 6 ? monthShort(m.month).slice(0, 3) : monthShort(m.month);
    const color = m.closed ? colours.surface : colours.caution700;
    drawText(doc, label, x, top + 5, {
      size: type.small,
      weight: "semibold",
      color,
      width: boxWidth,
      align: "center",
    });
    drawText(doc, m.closed ? "Closed" : "Open", x, top + 16, {
      size: 7,
      color,
      width: boxWidth,
      align: "center",
    });
  });
  doc.y = top + height + 8;
}

const carrierColumns = (first: string) => {
  const w = widths(1.25, 1.35, 1.2, 1.35, 0.8, 1.1, 1.05);
  return [
    { header: first, width: w[0] },
    { header: "Delivered (kWh)", width: w[1], align: "right" as const },
    { header: "Exported (kWh)", width: w[2], align: "right" as const },
    { header: "Net (kWh)", width: w[3], align: "right" as const },
    { header: "Estimated", width: w[4], align: "right" as const },
    { header: "± EN 1434 band (kWh)", width: w[5], align: "right" as const },
    {
      header: "Adjustments since close (kWh)",
      width: w[6],
      align: "right" as const,
    },
  ];
};

function adjustments(total: EntryTotal): string {
  return total.adjustmentCount
    ? `${kwh(total.adjustmentsKwh)} (${total.adjustmentCount})`
    : "—";
}

function totalCells(label: string, t: EntryTotal): string[] {
  return [
    label,
    kwh(t.importsKwh),
    kwh(t.exportsKwh),
    kwh(t.netKwh),
    share(t.estimatedShare),
    band(t.uncertaintyKwh),
    adjustments(t),
  ];
}

function drawCarrierTotals(doc: PDFKit.PDFDocument, data: ReportData) {
  // The ledger's own totals, one per carrier: the digits the Ledger page shows.
  const rows: Row[] = data.carrierTotals.map((t) => ({
    cells: [
      {
        text: carrierLabels[t.carrier],
        weight: "semibold" as const,
        color: carrierColours[t.carrier],
      },
      ...totalCells("", t).slice(1),
    ],
  }));
  drawTable(doc, {
    columns: carrierColumns("Carrier"),
    rows,
    caption: "Totals by carrier",
  });
}

/** Each site's figures, one line per carrier; the site's months closed on its first line. */
function drawSiteTotals(doc: PDFKit.PDFDocument, data: ReportData) {
  const w = widths(1.9, 1.0, 1.2, 1.1, 1.2, 0.8, 0.9);
  const columns = [
    { header: "Site", width: w[0] },
    { header: "Carrier", width: w[1] },
    { header: "Delivered (kWh)", width: w[2], align: "right" as const },
    { header: "Exported (kWh)", width: w[3], align: "right" as const },
    { header: "Net (kWh)", width: w[4], align: "right" as const },
    { header: "Estimated", width: w[5], align: "right" as const },
    { header: "Months closed", width: w[6], align: "right" as const },
  ];
  const rows: Row[] = data.sites.flatMap((site): Row[] => {
    const months = new Map<string, boolean>();
    for (const t of site.tables)
      for (const e of t.entries)
        months.set(
          e.month,
          (months.get(e.month) ?? true) && e.status === "closed",
        );
    const closed = [...months.values()].filter(Boolean).length;
    const name = { text: site.name, weight: "semibold" as const };
    const status = months.size ? `${closed} of ${months.size}` : "no entries";
    if (site.tables.length === 0)
      return [{ cells: [name, "—", "", "", "", "", status] }];
    return site.tables.map((t, i) => ({
      cells: [
        i === 0 ? name : "",
        { text: carrierLabels[t.carrier], color: carrierColours[t.carrier] },
        kwh(t.total.importsKwh),
        kwh(t.total.exportsKwh),
        kwh(t.total.netKwh),
        share(t.total.estimatedShare),
        i === 0 ? status : "",
      ],
    }));
  });
  drawTable(doc, { columns, rows, caption: "Sites" });
}

export function drawSummary(doc: PDFKit.PDFDocument, data: ReportData): void {
  heading(doc, "Summary", 1);
  body(doc, [
    {
      text: `Energy that crossed the boundaries of ${data.scope.siteId ? data.scope.label : "the organisation's sites"} in ${data.period.label}, from the monthly ledger. `,
    },
    {
      text: "Energy delivered to a site is positive and energy exported negative, per carrier",
      weight: "semibold",
    },
    {
      text: " (delivered and exported energy, as EN ISO 52000-1 names them). Chilled water is cooling delivered, a positive quantity of its own carrier. Unlike carriers are never added into one kWh figure. The thermodynamic view (heat and work into the site positive) appears only in each site's energy balance. The estimated column is the share of the energy that comes from estimated hours; the band is the EN 1434 maximum permissible error of rated heat meters, added up.",
    },
  ]);
  space(doc, 4);
  heading(doc, "Months", 3, 40);
  drawMonthStrip(doc, data);
  space(doc, 6);
  heading(doc, "Totals by carrier", 3, 80);
  if (data.carrierTotals.length === 0)
    body(doc, "The ledger has no entries for this period.");
  else drawCarrierTotals(doc, data);
  space(doc, 14);
  heading(doc, "Sites", 3, 80);
  drawSiteTotals(doc, data);
  space(doc, 14);
  if (data.carrierTotals.length > 0 && data.months.length > 1) {
    heading(
      doc,
      "Energy delivered and exported per month, by carrier",
      3,
      chartHeight(120),
    );
    drawMonthlyChart(doc, {
      months: data.months.map((m) => m.month),
      bars: monthlyByCarrier(
        data.sites,
        data.months.map((m) => m.month),
      ),
      height: 120,
      axisTitle: "Delivered (+) and exported (−)",
    });
  }
}
