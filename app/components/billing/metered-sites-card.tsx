import { Link } from "react-router";
import type { BillingOverview } from "~/billing/overview.server";
import { SectionCard } from "~/components/section-card";
import { BigFigure } from "./big-figure";

/** How many sites the plan bills, and which. */
export function MeteredSitesCard({
  orgId,
  sites,
}: {
  orgId: string;
  sites: BillingOverview["meteredSites"];
}) {
  return (
    <SectionCard
      headingId="metered-heading"
      title="Metered sites"
      className="flex flex-col gap-3"
    >
      <BigFigure testId="metered-count">{sites.length}</BigFigure>
      {sites.length === 0 ? (
        <p className="text-sm text-ink-muted">
          No site has an active meter yet. The plan bills at least one site.
        </p>
      ) : (
        <ul className="flex flex-col gap-1 text-sm">
          {sites.map((site) => (
            <li key={site.id} className="flex justify-between gap-2">
              <Link
                to={`/o/${orgId}/sites/${site.id}`}
                className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
              >
                {site.name}
              </Link>
              <span className="text-ink-muted">
                {site.activeMeters} meter{site.activeMeters === 1 ? "" : "s"}
              </span>
            </li>
          ))}
        </ul>
      )}
      <p className="mt-auto text-sm text-ink-muted">
        A site counts once it has at least one active meter; archived sites and
        removed meters do not.
      </p>
    </SectionCard>
  );
}
