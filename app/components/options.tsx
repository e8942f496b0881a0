/** A site as a menu lists it. */
export interface SiteChoice {
  id: string;
  name: string;
}

/**
 * The `<option>`s of a site picker: each site's id, shown by its name; with
 * `all`, first an option of the empty value that means every site.
 */
export function SiteOptions({
  sites,
  all,
}: {
  sites: readonly SiteChoice[];
  all?: string;
}) {
  return (
    <>
      {all === undefined ? null : <option value="">{all}</option>}
      {sites.map((s) => (
        <option key={s.id} value={s.id}>
          {s.name}
        </option>
      ))}
    </>
  );
}

/** The `<option>`s of a fixed list (carriers, quantities): each value, shown by its label. */
export function LabelledOptions<T extends string>({
  values,
  labels,
}: {
  values: readonly T[];
  labels: Record<T, string>;
}) {
  return values.map((v) => (
    <option key={v} value={v}>
      {labels[v]}
    </option>
  ));
}
