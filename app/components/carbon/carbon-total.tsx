import type { Ledger } from "~/components/ledger/use-ledger";
import { formatCount, formatNumber } from "~/lib/format";

/**
 * Carbon over every carrier of the ledger shown: carbon, unlike kWh, may be
 * added across carriers. Location-based and market-based side by side.
 */
export function CarbonTotal({ ledger }: { ledger: Ledger }) {
  const total = ledger.carbon_total;
  const tonnes = (kg: string) =>
    formatNumber(Number(kg) / 1000, 1, { fixed: true });
  return (
    <p data-testid="carbon-total">
      <strong>Carbon, all carriers:</strong> {tonnes(total.co2e_kg)} t CO₂e
      location-based, {tonnes(total.co2e_market_kg)} t CO₂e market-based
      (delivered energy; exports are not netted off).
      {total.rows_without_factor > 0
        ? ` ${formatCount(total.rows_without_factor)} entries have no emission factor for their carrier and year and are left out.`
        : null}
    </p>
  );
}
