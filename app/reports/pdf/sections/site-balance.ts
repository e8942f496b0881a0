/**
 * A site's energy balance over the period, the thermodynamic view (heat and
 * work into the site positive): the flow diagram of what entered and left
 * its boundary and what stayed, and each parent meter against its
 * sub-meters (the distribution loss), signed as stored.
 */
import type { Residual, SiteReport } from "../../data/types";
import {
  balanceChartHeight,
  drawBalanceChart,
  type Flow,
} from "../charts/balance-chart";
import { deliveredSign } from "~/ledger/delivered";
import { kwh, share, signedNumber } from "../format";
import { body, heading, space } from "../layout";
import { drawTable, widths, type Cell } from "../table";
import { carrierColours, colours } from "../theme";
import { carrierLabels } from "~/sites/meter-kinds";

type Flows = { inflows: Flow[]; outflows: Flow[] };

/**
 * The thermodynamic view of the ledger's figures: each carrier's delivered
 * and exported energy turned into heat or work into the site (delivered.ts),
 * positive flowing in, negative out; the net Q + W closes the balance.
 * Cooling delivered is heat taken out of the site, so it flows out.
 */
export function flows(site: SiteReport): Flows {
  const result: Flows = { inflows: [], outflows: [] };
  for (const c of site.balance.carriers) {
    const name = carrierLabels[c.carrier];
    const color = carrierColours[c.carrier];
    const sign = deliveredSign(c.carrier);
    const add = (kind: "delivered" | "exported", value: string) => {
      const intoSite = sign * Number(value);
      if (intoSite === 0) return;
      const heat =
        sign < 0 ? (intoSite > 0 ? " (heat in)" : " (heat out)") : "";
      const flow = {
        label: `${name} ${kind}${heat}`,
        kwh: Math.abs(intoSite),
        detail: `${signedNumber(intoSite)} kWh`,
        color,
      };
      (intoSite > 0 ? result.inflows : result.outflows).push(flow);
    };
    add("delivered", c.importsKwh);
    add("exported", c.exportsKwh);
  }
  const net = Number(site.balance.netIntoSiteKwh);
  const netFlow = {
    kwh: Math.abs(net),
    detail: `${kwh(site.balance.netIntoSiteKwh)} kWh`,
    color: colours.inkFaint,
  };
  if (net > 0)
    result.outflows.push({ ...netFlow, label: "Used or lost within the site" });
  if (net < 0)
    result.inflows.push({ ...netFlow, label: "More out than in (net)" });
  return result;
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
    netDetail: `Q + W ${kwh(site.balance.netIntoSiteKwh)} kWh`,
    inflows,
    outflows,
  };
  heading(
    doc,
    "Energy balance (thermodynamic view)",
    2,
    balanceChartHeight(chart),
  );
  if (site.balance.carriers.length === 0) {
    body(doc, "Nothing crossed this site's boundary in the period.", {
      color: colours.inkMuted,
    });
    return;
  }
  drawBalanceChart(doc, chart);
  body(
    doc,
    "The site as a thermodynamic system: heat Q and work W into the site positive, out of it negative. Boundary meters only, with the ledger's figures for the period: what entered the site on the left, what left it on the right, and the net Q + W, which was used or lost within the boundary. Cooling delivered is heat leaving the site, so it stands on the right. Both sides add up to the same energy. This is the only place the report adds carriers together.",
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
