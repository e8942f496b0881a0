import type { ReactNode } from "react";
import { Card, Field, Notice, SelectField } from "~/components/ui";
import {
  carrierLabels,
  carriers,
  isCarrier,
  type Carrier,
} from "~/sites/meter-kinds";

/** One choice of a filter menu: its value in the URL and its words. */
export interface FilterChoice {
  value: string;
  label: string;
}

/** The carrier asked for in the URL, or "" (all) for anything else. */
export function carrierFilter(value: string): Carrier | "" {
  return isCarrier(value) ? value : "";
}

export const carrierChoices: readonly FilterChoice[] = carriers.map((c) => ({
  value: c,
  label: carrierLabels[c],
}));

/** Sites, people: anything with an id and a name, as menu choices. */
export function namedChoices(
  sites: readonly { id: string; name: string }[],
): FilterChoice[] {
  return sites.map((s) => ({ value: s.id, label: s.name }));
}

/** A filter menu kept in the URL: "all" (the empty value) first, then the choices. */
export function FilterSelect({
  label,
  name,
  value,
  all,
  choices,
  onChange,
}: {
  label: string;
  name: string;
  value: string;
  /** The words for no filter; without them the menu has no empty choice. */
  all?: string;
  choices: readonly FilterChoice[];
  onChange: (value: string) => void;
}) {
  return (
    <SelectField
      label={label}
      name={name}
      value={value}
      onChange={(e) => onChange(e.target.value)}
    >
      {all === undefined ? null : <option value="">{all}</option>}
      {choices.map((c) => (
        <option key={c.value} value={c.value}>
          {c.label}
        </option>
      ))}
    </SelectField>
  );
}

/** Why a grid's data could not be fetched, under the filters that asked for it. */
export function FetchError({ error }: { error: string | null | undefined }) {
  return error ? (
    <div className="mt-3">
      <Notice tone="error">{error}</Notice>
    </div>
  ) : null;
}

/**
 * The filters of a page whose grid is fetched in the browser: the fields,
 * then a live line saying what the grid holds, then the fetch's error.
 */
export function FiltersCard({
  children,
  status,
  error,
}: {
  children: ReactNode;
  status: string;
  error: string | null | undefined;
}) {
  return (
    <Card aria-labelledby="filters-heading">
      <h2 id="filters-heading" className="sr-only">
        Filters
      </h2>
      {children}
      <p className="mt-3 text-sm text-ink-muted" role="status">
        {status}
      </p>
      <FetchError error={error} />
    </Card>
  );
}

/**
 * "From" and "To" fields of a period kept in the URL: months or days. Each
 * bounds the other's picker once it holds a whole value (`pattern`).
 */
export function PeriodFields({
  unit,
  pattern,
  from,
  to,
  errors,
  set,
}: {
  unit: "month" | "day";
  pattern: RegExp;
  from: string;
  to: string;
  errors: { fromError?: string; toError?: string };
  set: (name: "from" | "to", value: string) => void;
}) {
  const type = unit === "month" ? "month" : "date";
  return (
    <>
      <Field
        label={`From ${unit}`}
        name="from"
        type={type}
        value={from}
        max={pattern.test(to) ? to : undefined}
        onChange={(e) => set("from", e.target.value)}
        error={errors.fromError}
      />
      <Field
        label={`To ${unit}`}
        name="to"
        type={type}
        value={to}
        min={pattern.test(from) ? from : undefined}
        onChange={(e) => set("to", e.target.value)}
        error={errors.toError}
      />
    </>
  );
}
