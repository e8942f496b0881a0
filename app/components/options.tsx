/** The `<option>`s of a site picker: each site's id, shown by its name. */
export function SiteOptions({
  sites,
}: {
  sites: readonly { id: string; name: string }[];
}) {
  return sites.map((s) => (
    <option key={s.id} value={s.id}>
      {s.name}
    </option>
  ));
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
