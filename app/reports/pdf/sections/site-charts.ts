/** Chart series built from the ledger tables of one or more sites. */
import { sumDecimals } from "../../data/decimal";
import { carrierLabels, carrierReportOrder } from "~/sites/meter-kinds";
import type { Carrier, LedgerEntry, SiteReport } from "../../data/types";
import type { BarSeries } from "../charts/monthly-chart";
import { carrierColours } from "../theme";

/** A figure of one carrier per month (YYYY-MM), summed over the sites. */
function perMonth(
  sites: readonly SiteReport[],
  carrier: Carrier,
  months: readonly string[],
  pick: (e: LedgerEntry) => string,
): (number | null)[] {
  return months.map((month) => {
    const values = sites.flatMap((s) =>
      s.tables
        .filter((t) => t.carrier === carrier)
        .flatMap((t) => t.entries.filter((e) => e.month === month).map(pick)),
    );
    return values.length ? Number(sumDecimals(values)) : null;
  });
}

/**
 * Delivered (≥ 0) and exported (≤ 0) energy per month, one bar per carrier:
 * carriers stand side by side, never stacked on each other. An exported
 * series appears only for a carrier that exported something.
 */
export function monthlyByCarrier(
  sites: readonly SiteReport[],
  months: readonly string[],
): BarSeries[] {
  const carriers = carrierReportOrder.filter((c) =>
    sites.some((s) => s.tables.some((t) => t.carrier === c)),
  );
  return carriers.flatMap((carrier) => {
    const delivered: BarSeries = {
      label: `${carrierLabels[carrier]} delivered`,
      color: carrierColours[carrier],
      values: perMonth(sites, carrier, months, (e) => e.importsKwh),
      group: carrier,
    };
    const exportedValues = perMonth(
      sites,
      carrier,
      months,
      (e) => e.exportsKwh,
    );
    const exported: BarSeries = {
      label: `${carrierLabels[carrier]} exported`,
      color: carrierColours[carrier],
      values: exportedValues,
      group: carrier,
      opacity: 0.45,
    };
    return exportedValues.some((v) => v !== null && v !== 0)
      ? [delivered, exported]
      : [delivered];
  });
}

export function monthlyByCarrierOfSite(
  site: SiteReport,
  months: readonly string[],
): BarSeries[] {
  return monthlyByCarrier([site], months);
}
