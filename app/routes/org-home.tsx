import { can, roleDescriptions, roleLabels, roles } from "~/auth/permissions";
import { requirePermission } from "~/auth/page-access.server";
import { Cautions } from "~/components/cautions";
import { RelativeTime } from "~/components/relative-time";
import { Badge, Card, EmptyState, PageHeader } from "~/components/ui";
import { listGateways } from "~/gateways/list-gateways.server";
import { listMembers } from "~/organizations/members.server";
import type { Route } from "./+types/org-home";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `${loaderData?.organization.name ?? "Organisation"} · Joulebook` },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context);
  const members = await listMembers({ organizationId: organization.id });
  const gateways = can(role, "gateways.manage")
    ? await listGateways({ organizationId: organization.id })
    : null;
  const membersByRole = Object.fromEntries(
    roles.map((r) => [r, members.filter((m) => m.role === r).length]),
  );
  return {
    organization,
    role,
    membersByRole,
    gateways,
    now: new Date().toISOString(),
  };
}

export default function OrganizationHome({ loaderData }: Route.ComponentProps) {
  const { organization, role, membersByRole, gateways, now } = loaderData;
  return (
    <>
      <PageHeader
        title={organization.name}
        description={
          <>
            You are <Badge tone="spruce">{roleLabels[role]}</Badge> here:{" "}
            {roleDescriptions[role].toLowerCase()}
          </>
        }
      />
      <div className="grid gap-5 md:grid-cols-2">
        <Card aria-labelledby="people-heading">
          <h2 id="people-heading" className="text-lg">
            People
          </h2>
          <dl className="mt-3 grid grid-cols-2 gap-3">
            {roles.map((r) => (
              <div key={r} className="rounded-lg bg-paper px-3 py-2">
                <dt className="text-sm text-ink-muted">{roleLabels[r]}</dt>
                <dd className="text-2xl font-semibold">{membersByRole[r]}</dd>
              </div>
            ))}
          </dl>
        </Card>
        <Card aria-labelledby="gateways-heading">
          <h2 id="gateways-heading" className="text-lg">
            Gateways
          </h2>
          {gateways === null ? (
            <p className="mt-3 text-ink-muted">
              Gateways are managed by owners and energy managers.
            </p>
          ) : gateways.length === 0 ? (
            <div className="mt-3">
              <EmptyState title="No gateways yet">
                Gateways post meter readings with their own key.
              </EmptyState>
            </div>
          ) : (
            <ul className="mt-3 divide-y divide-line">
              {gateways.map((g) => (
                <li
                  key={g.id}
                  className="flex items-center justify-between gap-3 py-2"
                >
                  <div>
                    <p className="font-semibold">{g.name}</p>
                    <p className="font-mono text-sm text-ink-muted">
                      {g.keyPrefix}…
                    </p>
                  </div>
                  <div className="text-right text-sm">
                    {g.revokedAt ? (
                      <Badge tone="danger">Revoked</Badge>
                    ) : (
                      <Badge tone="spruce">Active</Badge>
                    )}
                    <p className="mt-1 text-ink-muted">
                      {g.lastSeenAt ? (
                        <>
                          Seen <RelativeTime at={g.lastSeenAt} now={now} />
                        </>
                      ) : (
                        "Not seen yet"
                      )}
                    </p>
                  </div>
                </li>
              ))}
            </ul>
          )}
        </Card>
        <Card className="md:col-span-2" aria-labelledby="api-heading">
          <h2 id="api-heading" className="text-lg">
            Gateway API
          </h2>
          <p className="mt-2 text-ink-muted">
            Gateways authenticate with{" "}
            <code className="font-mono">Authorization: Bearer &lt;key&gt;</code>
            . The machine-readable description is at{" "}
            <a
              className="font-semibold text-spruce-700 underline"
              href="/api/v1/openapi.json"
            >
              /api/v1/openapi.json
            </a>
            .
          </p>
        </Card>
      </div>
      <div className="mt-6">
        <Cautions />
      </div>
    </>
  );
}
