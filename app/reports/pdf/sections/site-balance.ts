/**
 * A site's energy balance over the period: the flow diagram of what entered
 * and left its boundary and what stayed, and each parent meter against its
 * sub-meters (the distribution loss).
 */
import type { Residual, SiteReport } from "../../data/types";
import {
  balanceChartHeight,
  drawBalanceChart,
  type Flow,
} from "../charts/balance-chart";
import { kwh, share } from "../format";
import { body, heading, space } from "../layout";
import { drawTable, widths, type Cell } from "../table";
import { carrierColours, carrierNames, colours } from "../theme";

/** Positive figures flow in, negative ones out; the net closes the balance. */
export function flows(site: SiteReport): { inflows: Flow[]; outflows: Flow[] } {
  const inflows: Flow[] = [];
  const outflows: Flow[] = [];
  for (const c of site.balance.carriers) {
    const name = carrierNames[c.carrier];
    const color = carrierColours[c.carrier];
    const imports = Number(c.importsKwh);
    const exports = Number(c.exportsKwh);
    const detail = (value: string) => `${kwh(value)} kWh`;
    if (imports > 0)
      inflows.push({
        label: `${name} imported`,
        kwh: imports,
        detail: detail(c.importsKwh),
        color,
      });
    // Chilled water reads negative on an import meter: heat taken out of the site.
    if (imports < 0)
      outflows.push({
        label: `${name}: heat taken out`,
        kwh: -imports,
        detail: detail(c.importsKwh),
        color,
      });
    if (exports < 0)
      outflows.push({
        label: `${name} exported`,
        kwh: -exports,
        detail: detail(c.exportsKwh),
        color,
      });
    if (exports > 0)
      inflows.push({
        label: `${name} on export meters`,
        kwh: exports,
        detail: detail(c.exportsKwh),
        color,
      });
  }
  const net = Number(site.balance.netKwh);
  const netFlow = {
    kwh: Math.abs(net),
    detail: `${kwh(site.balance.netKwh)} kWh`,
    color: colours.inkFaint,
  };
  if (net > 0)
    outflows.push({ ...netFlow, label: "Used or lost within the site" });
  if (net < 0) inflows.push({ ...netFlow, label: "More out than in (net)" });
  return { inflows, outflows };
}

function check(r: Residual, tolerance: number): Cell {
  const limit = share(tolerance, 0);
  if (r.flag === "ok")
    return { text: `Within ${limit}`, color: colours.spruce700 };
  if (r.flag === "over_tolerance")
    return {
      text: `Over the ${limit} tolerance`,
      color: colours.caution700,
      weight: "semibold",
    };
  return {
    text: "Sub-meters exceed the parent",
    color: colours.danger600,
    weight: "semibold",
  };
}

function drawResiduals(
  doc: PDFKit.PDFDocument,
  site: SiteReport,
  tolerance: number,
) {
  const w = widths(1.7, 0.85, 1.1, 1.1, 1.05, 0.7, 1.3);
  drawTable(doc, {
    columns: [
      { header: "Parent meter", width: w[0], wrap: true },
      { header: "Sub-meters", width: w[1], align: "right" },
      { header: "Parent (kWh)", width: w[2], align: "right" },
      { header: "Σ sub-meters (kWh)", width: w[3], align: "right" },
      { header: "Residual (kWh)", width: w[4], align: "right" },
      { header: "Of parent", width: w[5], align: "right" },
      { header: "Check", width: w[6], wrap: true },
    ],
    rows: site.balance.residuals.map((r) => ({
      cells: [
        `${r.code} · ${r.name}`,
        String(r.childCount),
        kwh(r.parentKwh),
        kwh(r.childrenKwh),
        kwh(r.residualKwh),
        share(r.residualFraction),
        check(r, tolerance),
      ],
    })),
    caption: `${site.name}: sub-meter residuals`,
  });
}

export function drawSiteBalance(
  doc: PDFKit.PDFDocument,
  site: SiteReport,
  tolerance: number,
): void {
  const { inflows, outflows } = flows(site);
  const chart = {
    siteName: site.name,
    netDetail: `${kwh(site.balance.netKwh)} kWh`,
    inflows,
    outflows,
  };
  heading(doc, "Energy balance", 2, balanceChartHeight(chart));
  if (site.balance.carriers.length === 0) {
    body(doc, "Nothing crossed this site's boundary in the period.", {
      color: colours.inkMuted,
    });
    return;
  }
  drawBalanceChart(doc, chart);
  body(
    doc,
    "Boundary meters only, with the ledger's figures for the period: what entered the site on the left, what left it on the right, and the net, which was used or lost within the boundary. Both sides add up to the same energy.",
    { color: colours.inkMuted, size: 8.5 },
  );
  if (site.balance.residuals.length === 0) return;
  space(doc, 4);
  drawResiduals(doc, site, tolerance);
  space(doc, 3);
  body(
    doc,
    `Each parent meter against the sum of its direct sub-meters over the period, from the monthly rollups as they stand (corrections after a month close included). The residual, parent less sub-meters, is the distribution loss; above ${share(tolerance, 0)} of the parent it is flagged.`,
    { color: colours.inkMuted, size: 8.5 },
  );
}
