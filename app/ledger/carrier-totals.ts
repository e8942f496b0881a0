/**
 * The ledger's total rows, one per carrier: unlike carriers are never added.
 * The grid and the exports both show these, so they agree to the digit.
 * Plain module.
 */
import { addExact } from "./convert-energy-decimal";

/** What a total needs of each ledger entry (API field names). */
export interface TotalInput<C extends string = string> {
  site_id: string;
  floor_area_m2: string | null;
  carrier: C;
  imports_kwh: string;
  exports_kwh: string;
  estimated_kwh: string;
  uncertainty_kwh: string | null;
  adjustments_kwh: string;
  adjustment_count: number;
}

/** The server's sums per carrier (the API's `totals`). */
export interface ServerTotal<C extends string = string> {
  carrier: C;
  imports_kwh: string;
  exports_kwh: string;
  net_kwh: string;
}

export interface CarrierTotalRow<C extends string = string> {
  carrier: C;
  imports_kwh: string;
  exports_kwh: string;
  net_kwh: string;
  estimated_kwh: string;
  /** Estimated energy over the energy metered in and out, 0–1. */
  estimated_share: number;
  /** Σ of the entries' bands; null when none of them has one. */
  uncertainty_kwh: string | null;
  adjustments_kwh: string;
  adjustment_count: number;
  /** Σ floor area of the sites listed with the carrier; null if one has none. */
  floor_area_m2: string | null;
}

/**
 * Delivered, exported and net come from the server's sums; the rest is added
 * here over the carrier's entries, exactly. The estimated share is, as in
 * each entry, estimated energy over the energy metered in and out.
 * Uncertainty bands are added: a bound that holds even when the meters'
 * errors are correlated. Per m², a carrier's total is divided by the floor
 * area of every site listed with it, or not at all when one of them has none.
 * Rows come in the order of `order`.
 */
export function carrierTotals<C extends string>(
  rows: readonly TotalInput<C>[],
  totals: readonly ServerTotal<C>[],
  order: readonly C[],
): CarrierTotalRow<C>[] {
  return [...totals]
    .sort((a, b) => order.indexOf(a.carrier) - order.indexOf(b.carrier))
    .map((total) => {
      const mine = rows.filter((r) => r.carrier === total.carrier);
      const magnitude = (v: string) => v.replace(/^-/, "");
      const estimated = addExact(mine.map((r) => r.estimated_kwh));
      const metered = addExact(
        mine.flatMap((r) => [r.imports_kwh, r.exports_kwh].map(magnitude)),
      );
      const estimatedMagnitude = addExact(
        mine.map((r) => magnitude(r.estimated_kwh)),
      );
      const bands = mine
        .map((r) => r.uncertainty_kwh)
        .filter((b): b is string => b !== null);
      const areas = [
        ...new Map(mine.map((r) => [r.site_id, r.floor_area_m2])).values(),
      ];
      const allHaveArea = areas.every((a) => a !== null && Number(a) > 0);
      return {
        carrier: total.carrier,
        imports_kwh: total.imports_kwh,
        exports_kwh: total.exports_kwh,
        net_kwh: total.net_kwh,
        estimated_kwh: estimated,
        estimated_share:
          Number(metered) > 0
            ? Number(estimatedMagnitude) / Number(metered)
            : 0,
        uncertainty_kwh: bands.length ? addExact(bands.map(magnitude)) : null,
        adjustments_kwh: addExact(mine.map((r) => r.adjustments_kwh)),
        adjustment_count: mine.reduce((s, r) => s + r.adjustment_count, 0),
        floor_area_m2: allHaveArea ? addExact(areas as string[]) : null,
      };
    });
}
