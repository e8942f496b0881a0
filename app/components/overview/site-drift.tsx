import type { SiteDrift } from "~/overview/estate-overview.server";
import { SectionCard } from "~/components/section-card";
import {
  SiteChangeRow,
  SiteChangeTable,
  type MonthOfSitesProps,
} from "~/components/overview/site-change-table";

/** Beyond this change on a year before, a site's pill is marked. */
const DRIFT_TOLERANCE = 0.15;

/** Each site's delivered energy per carrier in `month` against a year before. */
export function SitesThatChanged({
  rows,
  month,
  base,
}: MonthOfSitesProps<SiteDrift>) {
  return (
    <SectionCard headingId="drift-heading" title="Sites that changed most">
      <p className="text-sm text-ink-muted">
        Energy delivered in {month} against the same month a year before, per
        carrier (boundary import meters; chilled water as cooling delivered): ▲
        more, ▼ less; solid beyond ±{DRIFT_TOLERANCE * 100} %.
      </p>
      <SiteChangeTable
        figureHeadings={[<>Delivered, {month}</>]}
        changeHeading="Change"
      >
        {rows.map((d) => (
          <SiteChangeRow
            key={`${d.site_id}|${d.carrier}`}
            siteId={d.site_id}
            siteName={d.site_name}
            siteLink={`${base}/sites/${d.site_id}`}
            carrier={d.carrier}
            figures={[d.delivered_kwh]}
            change={d.change}
            tolerance={DRIFT_TOLERANCE}
          />
        ))}
      </SiteChangeTable>
    </SectionCard>
  );
}
