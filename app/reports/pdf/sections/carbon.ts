/**
 * Carbon of the period's delivered energy, per carrier and across carriers,
 * location- and market-based, with the emission factors' sources named.
 */
import type { ReportData } from "../../data/types";
import { body, heading, space } from "../layout";
import { drawTable, widths, type Row } from "../table";
import { colours } from "../theme";
import { carrierLabels } from "~/sites/meter-kinds";
import { formatNumber } from "~/lib/format";

const kg = (value: string | null) =>
  value === null ? "—" : formatNumber(Number(value), 0, { fixed: true });

export function drawCarbon(doc: PDFKit.PDFDocument, data: ReportData): void {
  const { carbon } = data;
  space(doc, 18);
  heading(doc, "Carbon", 1, 160);
  body(
    doc,
    "kg CO₂e of the energy delivered to the sites in the period (exported energy is not netted off). Location-based figures use the year's factor for each carrier; market-based figures use a supply's own contract where it has one, else the set's residual mix. Closed months keep the carbon they were closed with; later changes are adjusting entries.",
    { color: colours.inkMuted, size: 8.5 },
  );
  space(doc, 4);
  const w = widths(2, 1.2, 1.2);
  const rows: Row[] = carbon.byCarrier.map((c) => ({
    cells: [carrierLabels[c.carrier], kg(c.co2eKg), kg(c.co2eMarketKg)],
  }));
  drawTable(doc, {
    columns: [
      { header: "Carrier", width: w[0] },
      { header: "Location-based (kg CO₂e)", width: w[1], align: "right" },
      { header: "Market-based (kg CO₂e)", width: w[2], align: "right" },
    ],
    rows: [
      ...rows,
      {
        kind: "total",
        cells: ["All carriers", kg(carbon.totalKg), kg(carbon.totalMarketKg)],
      },
    ],
  });
  if (carbon.rowsWithoutFactor > 0)
    body(
      doc,
      `${carbon.rowsWithoutFactor} ledger entries have no emission factor for their carrier and year and are left out of the carbon figures.`,
    );
  space(doc, 6);
  body(doc, "Emission factors used:", { size: 9 });
  if (carbon.sources.length === 0)
    body(doc, "No emission factors were set for the period's years.");
  for (const s of carbon.sources)
    body(
      doc,
      `${s.year} ${carrierLabels[s.carrier]} (scope ${s.scope}): ${s.source}, version ${s.version}.`,
      { size: 8.5 },
    );
}
