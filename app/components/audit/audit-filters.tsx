import { auditKindLabels, auditKinds, isAuditKind } from "~/audit/kinds";
import {
  carrierFilter,
  FilterSelect,
  namedChoices,
} from "~/components/filters";
import { Field } from "~/components/ui";
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
  const { fromError, toError } = periodErrors(values.from, values.to);
  const menu = (name: AuditFilterName) => ({
    name,
    value: values[name],
    onChange: (value: string) => set(name, value),
  });
  return (
    <div className="grid gap-4 sm:grid-cols-3 lg:grid-cols-6 lg:items-start">
      <FilterSelect
        label="Site"
        all="All sites"
        choices={namedChoices(options.sites)}
        {...menu("site")}
      />
      <FilterSelect
        label="Meter"
        all="All meters"
        choices={meters.map((m) => ({
          value: m.id,
          label: `${m.code} · ${m.name}`,
        }))}
        {...menu("meter")}
      />
      <FilterSelect
        label="Person"
        all="Everyone"
        choices={namedChoices(options.people)}
        {...menu("person")}
      />
      <FilterSelect
        label="Kind of change"
        all="Every kind"
        choices={kindChoices}
        {...menu("kind")}
      />
      <Field
        label="From day"
        name="from"
        type="date"
        value={values.from}
        max={DAY.test(values.to) ? values.to : undefined}
        onChange={(e) => set("from", e.target.value)}
        error={fromError}
      />
      <Field
        label="To day"
        name="to"
        type="date"
        value={values.to}
        min={DAY.test(values.from) ? values.from : undefined}
        onChange={(e) => set("to", e.target.value)}
        error={toError}
      />
    </div>
  );
}
