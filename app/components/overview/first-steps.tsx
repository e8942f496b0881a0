import { Link } from "react-router";
import type { SetupProgress } from "~/overview/estate-overview.server";
import { SectionCard } from "~/components/section-card";

/**
 * The first steps of an organisation: a site, a meter on it, a gateway to
 * send its readings. Each links to where it is done, for the roles that may
 * do it; a finished step is ticked.
 */
export function FirstSteps({
  setup,
  base,
  canManageSites,
  canManageGateways,
}: {
  setup: SetupProgress;
  base: string;
  canManageSites: boolean;
  canManageGateways: boolean;
}) {
  const title =
    setup.sites === 0
      ? "No sites yet"
      : setup.meters === 0
        ? "No meters yet"
        : "No gateway yet";
  const steps = [
    {
      label: "Add a site",
      done: setup.sites > 0,
      allowed: canManageSites,
      to: `${base}/sites#new-site-heading`,
      text: "A building or estate whose energy you account for: its name, time zone and floor area.",
    },
    {
      label: "Add a meter",
      done: setup.meters > 0,
      allowed: canManageSites,
      to: setup.firstSiteId
        ? `${base}/sites/${setup.firstSiteId}/meters/new`
        : `${base}/sites`,
      text: setup.firstSiteId
        ? "On the site's boundary: what it meters, its carrier, and whether it imports or exports."
        : "On the site's page, once there is a site: what it meters, its carrier, and whether it imports or exports.",
    },
    {
      label: "Add a gateway",
      done: setup.gateways > 0,
      allowed: canManageGateways,
      to: `${base}/gateways`,
      text: "It sends the meters' readings with its own key. Past readings can also be uploaded as CSV on Readings.",
    },
  ];
  return (
    <SectionCard headingId="first-steps-heading" title={title}>
      <p className="mt-1 text-ink-muted">
        The figures on this page appear once a meter on a site sends readings.
        Three steps get there:
      </p>
      <ol className="mt-4 grid gap-3 md:grid-cols-3">
        {steps.map((step, i) => (
          <li
            key={step.label}
            className="rounded-lg border border-line bg-paper p-4"
          >
            <p className="text-sm font-semibold text-ink-muted">
              {`Step ${i + 1}${step.done ? " · done" : ""}`}
            </p>
            {step.done ? (
              <p className="font-semibold">
                <span aria-hidden="true">✓ </span>
                {step.label}
              </p>
            ) : step.allowed ? (
              <Link
                to={step.to}
                className="font-semibold text-spruce-700 underline underline-offset-4"
              >
                {step.label}
              </Link>
            ) : (
              <p className="font-semibold">{step.label}</p>
            )}
            <p className="mt-1 text-sm text-ink-muted">
              {step.done || step.allowed
                ? step.text
                : "An owner or energy manager does this."}
            </p>
          </li>
        ))}
      </ol>
    </SectionCard>
  );
}
