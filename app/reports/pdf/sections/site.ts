/** One site's section: its facts, monthly ledger, baselines and balance. */
import { formatCelsius } from "~/lib/format";
import type { ReportData, SiteReport } from "../../data/types";
import { integer } from "../format";
import { body, heading, newPage, space } from "../layout";
import { colours } from "../theme";
import { drawSiteBalance } from "./site-balance";
import { drawSiteBaselines } from "./site-baseline";
import { drawSiteLedger } from "./site-ledger";

function facts(site: SiteReport): string {
  const months = new Map<string, boolean>();
  for (const t of site.tables)
    for (const e of t.entries)
      months.set(
        e.month,
        (months.get(e.month) ?? true) && e.status === "closed",
      );
  const closed = [...months.values()].filter(Boolean).length;
  return [
    `Time zone ${site.timeZone}`,
    `degree day base ${formatCelsius(site.degreeDayBaseC)}`,
    site.floorAreaM2 === null
      ? "floor area not recorded"
      : `floor area ${integer(site.floorAreaM2)} m²`,
    `${months.size} month${months.size === 1 ? "" : "s"} with ledger entries, ${closed} closed`,
    ...(site.archived ? ["archived"] : []),
  ].join(" · ");
}

export function drawSite(
  doc: PDFKit.PDFDocument,
  data: ReportData,
  site: SiteReport,
): void {
  newPage(doc);
  heading(doc, site.name, 1);
  body(doc, facts(site), { color: colours.inkMuted, after: 8 });
  heading(doc, "Monthly ledger", 2, 90);
  if (site.tables.length === 0)
    body(doc, "The ledger has no entries for this site in the period.", {
      color: colours.inkMuted,
    });
  else drawSiteLedger(doc, site);
  space(doc, 14);
  drawSiteBaselines(
    doc,
    site,
    data.months.map((m) => m.month),
  );
  space(doc, 14);
  drawSiteBalance(doc, site, data.method.residualTolerance);
}
