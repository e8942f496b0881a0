/**
 * A site's monthly ledger: one band per carrier, its months and the
 * carrier's total. Delivered and exported energy of each carrier; carriers
 * are never added into one total.
 */
import type {
  Carrier,
  EntryTotal,
  LedgerEntry,
  SiteReport,
} from "../../data/types";
import { formatCost, monthShort } from "~/lib/format";
import { band, kwh, share } from "../format";
import { drawTable, widths, type Row } from "../table";
import { carrierColours, colours } from "../theme";
import { carrierLabels } from "~/sites/meter-kinds";

function columns() {
  const w = widths(1.0, 1.2, 1.1, 1.2, 0.8, 1.05, 1.15, 1.1, 0.7);
  return [
    { header: "Month", width: w[0] },
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
    { header: "Cost", width: w[7], align: "right" as const },
    { header: "Status", width: w[8] },
  ];
}

function adjustments(amount: string, count: number): string {
  return count ? `${kwh(amount)} (${count})` : "—";
}

/** Money as priced (VAT included); a dash where no tariff applies. */
function money(cost: string | null, currency: string | null): string {
  return cost === null || currency === null ? "—" : formatCost(cost, currency);
}

function entryRow(e: LedgerEntry): Row {
  return {
    cells: [
      monthShort(e.month),
      kwh(e.importsKwh),
      kwh(e.exportsKwh),
      { text: kwh(e.netKwh), weight: "semibold" },
      {
        text: share(e.estimatedShare),
        color: e.estimatedShare > 0 ? colours.caution700 : colours.ink,
      },
      band(e.uncertaintyKwh),
      adjustments(e.adjustmentsKwh, e.adjustmentCount),
      money(e.cost, e.currency),
      e.status === "closed"
        ? { text: "Closed", color: colours.spruce700, weight: "semibold" }
        : { text: "Open", color: colours.caution700 },
    ],
  };
}

function totalRow(label: string, t: EntryTotal): Row {
  return {
    kind: "total",
    cells: [
      label,
      kwh(t.importsKwh),
      kwh(t.exportsKwh),
      kwh(t.netKwh),
      share(t.estimatedShare),
      band(t.uncertaintyKwh),
      adjustments(t.adjustmentsKwh, t.adjustmentCount),
      money(t.cost, t.currency),
      "",
    ],
  };
}

/** "Cooling delivered (chilled water)" says what the cooling band's figures are. */
function bandLabel(carrier: Carrier): string {
  return carrier === "cooling"
    ? "Cooling delivered (chilled water)"
    : carrierLabels[carrier];
}

export function drawSiteLedger(
  doc: PDFKit.PDFDocument,
  site: SiteReport,
): void {
  const rows: Row[] = [];
  for (const table of site.tables) {
    rows.push({
      kind: "band",
      cells: [
        {
          text: bandLabel(table.carrier),
          color: carrierColours[table.carrier],
        },
      ],
    });
    rows.push(...table.entries.map(entryRow));
    rows.push(totalRow("Total", table.total));
  }
  drawTable(doc, {
    columns: columns(),
    rows,
    caption: `${site.name}: monthly ledger`,
    keepRows: 4,
  });
}
