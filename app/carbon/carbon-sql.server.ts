/**
 * The one place that says which factor a meter's month takes, in SQL, so the
 * Ledger's aggregate and the closed-month snapshot (carbon-adjustments) can
 * never disagree:
 *
 * - location-based: the organisation's set for the month's calendar year and
 *   the meter's carrier;
 * - market-based: the supply's contract covering the month, else the set's
 *   market-based (residual mix) factor, else its location-based one.
 *
 * Products of numerics keep every digit, so carbon is exact.
 */

/** Left joins giving `ef` (the set) and `ec` (the contract) for a meter-month. */
export function factorJoinsSql(cols: {
  org: string;
  month: string;
  carrier: string;
  meterId: string;
}): string {
  return `left join emission_factor_sets ef
            on ef.organization_id = ${cols.org}
           and ef.year = extract(year from ${cols.month})::int
           and ef.carrier = ${cols.carrier}
          left join lateral (
            select c.kg_per_kwh from emission_contracts c
             where c.organization_id = ${cols.org} and c.meter_id = ${cols.meterId}
               and c.valid_from <= ${cols.month}
               and (c.valid_to is null or c.valid_to >= ${cols.month})
             order by c.valid_from desc, c.created_at desc limit 1) ec on true`;
}

export const LOCATION_FACTOR_SQL = "ef.location_kg_per_kwh";
export const MARKET_FACTOR_SQL =
  "coalesce(ec.kg_per_kwh, ef.market_kg_per_kwh, ef.location_kg_per_kwh)";
