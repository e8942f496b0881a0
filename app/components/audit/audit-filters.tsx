import { auditKindLabels, auditKinds, isAuditKind } from "~/audit/kinds";
import {
  carrierFilter,
  FilterSelect,
  namedChoices,
  PeriodFields,
  type FilterChoice,
} from "~/components/filters";
import { MONTH_PATTERN } from "~/lib/months";
import { useUrlFilters } from "~/lib/use-url-filters";
import type { AuditFilterName } from "./use-audit";

/** What the filter menus offer: this organisation's sites, meters and people. */
export interface AuditFilterOptions {
  sites: { id: string; name: string }[];
  meters: { id: string; code: string; name: string; siteId: string }[];
  people: { id: string; name: string }[];
}

export type AuditFilterValues = Record<AuditFilterName, string>;

const DAY = /^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;

const kindChoices = auditKinds.map((k) => ({
  value: k,
  label: auditKindLabels[k],
}));

/**
 * The filters as asked for in the URL, kept only where they make sense:
 * an id that is not one of this organisation's options is not used.
 */
export function useAuditFilters(options: AuditFilterOptions) {
  const [get, set] = useUrlFilters();
  const oneOf = (name: string, ids: readonly string[]) => {
    const value = get(name);
    return ids.includes(value) ? value : "";
  };
  const site = oneOf(
    "site",
    options.sites.map((s) => s.id),
  );
  const meters = site
    ? options.meters.filter((m) => m.siteId === site)
    : options.meters;
  const kind = get("kind");
  const since = get("since");
  const values: AuditFilterValues = {
    site,
    meter: oneOf(
      "meter",
      meters.map((m) => m.id),
    ),
    person: oneOf(
      "person",
      options.people.map((p) => p.id),
    ),
    kind: isAuditKind(kind) ? kind : "",
    from: get("from"),
    to: get("to"),
    month: MONTH_PATTERN.test(get("month")) ? get("month") : "",
    carrier: carrierFilter(get("carrier")),
    since: Number.isNaN(Date.parse(since)) ? "" : since,
  };
  return { values, meters, set };
}

/** What is wrong with a from…to period of days, beside each field. */
export function periodErrors(from: string, to: string) {
  const fromError =
    from && !DAY.test(from) ? "Use a day like 2026-01-31." : undefined;
  const toError =
    to && !DAY.test(to)
      ? "Use a day like 2026-01-31."
      : from && to && !fromError && to < from
        ? "The last day comes before the first."
        : undefined;
  return { fromError, toError };
}

/** The site, meter, person, kind of change and days of the Audit trail. */
export function AuditFilterFields({
  options,
  meters,
  values,
  set,
}: {
  options: AuditFilterOptions;
  /** The meters to offer: those of the chosen site. */
  meters: AuditFilterOptions["meters"];
  values: AuditFilterValues;
  set: (name: string, value: string) => void;
}) {
  const menus: [AuditFilterName, string, string, FilterChoice[]][] = [
    ["site", "Site", "All sites", namedChoices(options.sites)],
    [
      "meter",
      "Meter",
      "All meters",
      meters.map((m) => ({ value: m.id, label: `${m.code} · ${m.name}` })),
    ],
    ["person", "Person", "Everyone", namedChoices(options.people)],
    ["kind", "Kind of change", "Every kind", kindChoices],
  ];
  return (
    <div className="grid gap-4 sm:grid-cols-3 lg:grid-cols-6 lg:items-start">
      {menus.map(([name, label, all, choices]) => (
        <FilterSelect
          key={name}
          label={label}
          name={name}
          value={values[name]}
          all={all}
          choices={choices}
          onChange={(value) => set(name, value)}
        />
      ))}
      <PeriodFields
        unit="day"
        pattern={DAY}
        from={values.from}
        to={values.to}
        errors={periodErrors(values.from, values.to)}
        set={set}
      />
    </div>
  );
}
