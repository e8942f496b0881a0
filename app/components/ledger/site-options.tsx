/** A site as a menu lists it. */
export interface SiteChoice {
  id: string;
  name: string;
}

/** The options of a site menu: "all" (the empty value) first, then each site. */
export function SiteOptions({
  sites,
  all,
}: {
  sites: readonly SiteChoice[];
  all: string;
}) {
  return (
    <>
      <option value="">{all}</option>
      {sites.map((s) => (
        <option key={s.id} value={s.id}>
          {s.name}
        </option>
      ))}
    </>
  );
}
