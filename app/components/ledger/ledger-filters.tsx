import { useMemo } from "react";
import {
  carrierChoices,
  carrierFilter,
  FilterSelect,
  namedChoices,
  PeriodFields,
} from "~/components/filters";
import { periodPicks } from "~/financial-year/financial-year";
import { defaultMonths, periodErrors } from "~/ledger/ledger-period";
import { isLedgerUnit, ledgerUnits } from "~/ledger/ledger-units";
import { MONTH_PATTERN } from "~/lib/months";
import { useUrlFilters } from "~/lib/use-url-filters";
import type { SiteChoice } from "~/components/options";

const unitChoices = ledgerUnits.map((u) => ({ value: u, label: u }));

/**
 * The Ledger's filters as asked for in the URL, each kept only where it makes
 * sense (a site of this organisation, a known carrier and unit), with the
 * last twelve full months by default.
 */
export function useLedgerFilters(sites: readonly SiteChoice[]) {
  const [get, set, setAll] = useUrlFilters();
  const defaults = useMemo(() => defaultMonths(new Date()), []);
  const from = get("from") || defaults.from;
  const to = get("to") || defaults.to;
  const site = sites.some((s) => s.id === get("site")) ? get("site") : "";
  const unit = get("unit");
  const values = {
    from,
    to,
    site,
    carrier: carrierFilter(get("carrier")),
    unit: isLedgerUnit(unit) ? unit : "kWh",
    perM2: get("per") === "m2",
  };
  return { values, errors: periodErrors(from, to), set, setAll, defaults };
}

export type LedgerFilterState = ReturnType<typeof useLedgerFilters>;

/** The months, site, carrier, unit and per m² of the Ledger page. */
export function LedgerFilterFields({
  filters: { values, errors, set, setAll, defaults },
  sites,
  financialYearStart,
}: {
  filters: LedgerFilterState;
  sites: readonly SiteChoice[];
  /** The month (1–12) the organisation's financial year starts in. */
  financialYearStart: number;
}) {
  // The financial years and quarters up to the last full month's, newest first.
  const picks = periodPicks(defaults.to, financialYearStart);
  const picked =
    picks.find((p) => p.from === values.from && p.to === values.to)?.value ??
    "";
  return (
    <div className="grid gap-4 sm:grid-cols-3 lg:grid-cols-6 lg:items-end">
      <FilterSelect
        label="Financial period"
        name="fy"
        value={picked}
        all="Months as chosen"
        choices={picks.map((p) => ({ value: p.value, label: p.label }))}
        onChange={(value) => {
          const pick = picks.find((p) => p.value === value);
          if (pick) setAll({ from: pick.from, to: pick.to });
        }}
      />
      <PeriodFields
        unit="month"
        pattern={MONTH_PATTERN}
        from={values.from}
        to={values.to}
        errors={errors}
        set={set}
      />
      <FilterSelect
        label="Site"
        name="site"
        value={values.site}
        all="All sites"
        choices={namedChoices(sites)}
        onChange={(value) => set("site", value)}
      />
      <FilterSelect
        label="Carrier"
        name="carrier"
        value={values.carrier}
        all="All carriers"
        choices={carrierChoices}
        onChange={(value) => set("carrier", value)}
      />
      <FilterSelect
        label="Unit"
        name="unit"
        value={values.unit}
        choices={unitChoices}
        // kWh is the default, so it leaves the URL.
        onChange={(value) => set("unit", value === "kWh" ? "" : value)}
      />
      <label className="flex min-h-10 items-center gap-2 font-semibold">
        <input
          type="checkbox"
          name="per"
          value="m2"
          checked={values.perM2}
          onChange={(e) => set("per", e.target.checked ? "m2" : "")}
          className="h-5 w-5 accent-spruce-700"
        />
        per m² of floor area
      </label>
    </div>
  );
}
