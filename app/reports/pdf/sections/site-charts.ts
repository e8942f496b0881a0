/** Chart series built from the ledger tables of one or more sites. */
import { sumDecimals } from "../../data/decimal";
import { CARRIER_ORDER } from "../../data/ledger-tables";
import type { SiteReport } from "../../data/types";
import type { BarSeries } from "../charts/monthly-chart";
import { carrierColours, carrierNames } from "../theme";

/** Net energy per month (YYYY-MM) and carrier, summed over the sites. */
export function monthlyByCarrier(
  sites: readonly SiteReport[],
  months: readonly string[],
): BarSeries[] {
  const carriers = CARRIER_ORDER.filter((c) =>
    sites.some((s) => s.tables.some((t) => t.carrier === c)),
  );
  return carriers.map((carrier) => ({
    label: carrierNames[carrier],
    color: carrierColours[carrier],
    values: months.map((month) => {
      const values = sites.flatMap((s) =>
        s.tables
          .filter((t) => t.carrier === carrier)
          .flatMap((t) =>
            t.entries.filter((e) => e.month === month).map((e) => e.netKwh),
          ),
      );
      return values.length ? Number(sumDecimals(values)) : null;
    }),
  }));
}

export function monthlyByCarrierOfSite(
  site: SiteReport,
  months: readonly string[],
): BarSeries[] {
  return monthlyByCarrier([site], months);
}
