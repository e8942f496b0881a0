import { Link } from "react-router";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { CarrierBadge } from "~/components/carrier-badge";
import { ReadingsUpload } from "~/components/readings-upload/readings-upload";
import { Badge, Card, EmptyState, PageHeader } from "~/components/ui";
import { resolutionMinutes } from "~/ingest/interval-energy";
import { listAllMeters } from "~/sites/meters.server";
import type { Route } from "./+types/readings";

export const meta: Route.MetaFunction = () => [
  { title: "Readings · Joulebook" },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "readings.view");
  const meters = await listAllMeters({ organizationId: organization.id });
  return {
    organization,
    meters,
    // What the upload checks a file against: each meter's kind, site clock and resolution.
    uploadMeters: meters.map((m) => ({
      id: m.id,
      code: m.code,
      name: m.name,
      quantity: m.quantity,
      siteName: m.siteName,
      timeZone: m.timeZone,
      intervalMinutes: resolutionMinutes(m),
    })),
    canUpload: can(role, "readings.edit"),
  };
}

export default function Readings({ loaderData }: Route.ComponentProps) {
  const { meters, uploadMeters, organization, canUpload } = loaderData;
  const bySite = new Map<string, typeof meters>();
  for (const m of meters)
    bySite.set(m.siteName, [...(bySite.get(m.siteName) ?? []), m]);
  return (
    <>
      <PageHeader
        title="Readings"
        description="Each meter's intervals (hourly, half-hourly or every 15 minutes): actual, estimated or edited, with the readings they come from."
      />
      <div className="flex flex-col gap-6">
        {meters.length === 0 ? (
          <EmptyState title="No meters yet">
            Add sites and meters first.
          </EmptyState>
        ) : (
          <div className="grid gap-4 md:grid-cols-2">
            {[...bySite].map(([site, siteMeters]) => (
              <Card key={site} aria-label={site}>
                <h2 className="text-lg">{site}</h2>
                <ul className="mt-2 divide-y divide-line">
                  {siteMeters.map((m) => (
                    <li
                      key={m.id}
                      className="flex items-center justify-between gap-2 py-2"
                    >
                      <Link
                        to={`/o/${organization.id}/meters/${m.id}/readings`}
                        className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                      >
                        <span className="font-mono">{m.code}</span> {m.name}
                      </Link>
                      <span className="flex gap-1">
                        <CarrierBadge carrier={m.carrier} />
                        {m.removedAt ? <Badge>retired</Badge> : null}
                      </span>
                    </li>
                  ))}
                </ul>
              </Card>
            ))}
          </div>
        )}
        {canUpload ? (
          <Card aria-labelledby="upload-heading">
            <h2 id="upload-heading" className="text-lg">
              Upload historical readings
            </h2>
            <p className="mt-1 text-ink-muted">
              Readings go through the same checks as a gateway&apos;s; a reading
              already stored counts as already stored, so sending a file twice
              changes nothing.
            </p>
            <div className="mt-4">
              <ReadingsUpload orgId={organization.id} meters={uploadMeters} />
            </div>
          </Card>
        ) : null}
      </div>
    </>
  );
}
