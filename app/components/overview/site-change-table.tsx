import type { ReactNode } from "react";
import { Link } from "react-router";
import { CarrierBadge } from "~/components/carrier-badge";
import { ChangePill } from "~/components/change-pill";
import type { Carrier } from "~/sites/meter-kinds";
import { formatKwh } from "~/lib/format";

/** A card of the sites' figures for one month. */
export interface MonthOfSitesProps<Row> {
  rows: Row[];
  /** YYYY-MM */
  month: string;
  /** The organisation's pages, `/o/<id>`. */
  base: string;
}

/**
 * A table of sites and carriers, each row an amount of energy set against
 * another with a change pill: Site, Carrier, the figures, the change.
 */
export function SiteChangeTable({
  figureHeadings,
  changeHeading,
  children,
}: {
  /** Headings of the kWh columns, in the order of each row's `figures`. */
  figureHeadings: ReactNode[];
  changeHeading: string;
  children: ReactNode;
}) {
  const right = "py-1 text-right font-semibold";
  return (
    <div className="mt-3 overflow-x-auto">
      <table className="w-full text-left">
        <thead className="text-sm text-ink-muted">
          <tr>
            <th className="py-1 font-semibold">Site</th>
            <th className="py-1 font-semibold">Carrier</th>
            {figureHeadings.map((heading, i) => (
              <th key={i} className={right}>
                {heading}
              </th>
            ))}
            <th className={right}>{changeHeading}</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-line">{children}</tbody>
      </table>
    </div>
  );
}

/** One site and carrier of a SiteChangeTable; `data` adds attributes tests and tools read. */
export function SiteChangeRow({
  siteId,
  siteName,
  siteLink,
  note,
  carrier,
  figures,
  change,
  tolerance,
  data,
}: {
  siteId: string;
  siteName: string;
  siteLink: string;
  /** A line under the site's name, e.g. why a figure is missing. */
  note?: ReactNode;
  carrier: Carrier;
  figures: (number | null)[];
  change: number | null;
  tolerance: number;
  data?: Record<`data-${string}`, string | undefined>;
}) {
  const figure = "py-2 text-right tabular-nums";
  return (
    <tr data-site={siteId} data-carrier={carrier} {...data}>
      <td className="py-2">
        <Link
          className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
          to={siteLink}
        >
          {siteName}
        </Link>
        {note !== undefined && note !== null ? (
          <span className="block text-sm text-ink-muted">{note}</span>
        ) : null}
      </td>
      <td className="py-2">
        <CarrierBadge carrier={carrier} />
      </td>
      {figures.map((kwh, i) => (
        <td key={i} className={figure}>
          {formatKwh(kwh)}
        </td>
      ))}
      <td className={figure}>
        <ChangePill change={change} tolerance={tolerance} />
      </td>
    </tr>
  );
}
